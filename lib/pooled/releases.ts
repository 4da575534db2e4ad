import {
  flushWindows,
  type DryingStatisticsRow,
  type FlushStatisticsRow,
  type FlushWindow,
  type RegimeStatisticsRow,
  type SeasonStatisticsRow,
  type StrainStatisticsRow,
} from "./types";

/** A farm's sufficient statistics for one cell and flush window, as a release keeps them (trial arms added together). */
export interface ReleaseStrainRow extends StrainStatisticsRow {
  speciesId: string;
  flushWindow: FlushWindow;
}

export interface ReleaseFlushRow extends FlushStatisticsRow {
  speciesId: string;
}

export interface ReleaseSeasonRow extends SeasonStatisticsRow {
  speciesId: string;
  flushWindow: FlushWindow;
}

export interface ReleaseDryingRow extends DryingStatisticsRow {
  speciesId: string;
}

/** Everything a release publishes from: every farm's rows, read only through the analyst role. */
export interface ReleaseContents {
  strainRows: ReleaseStrainRow[];
  flushRows: ReleaseFlushRow[];
  seasonRows: ReleaseSeasonRow[];
  dryingRows: ReleaseDryingRow[];
  regimeRows: RegimeStatisticsRow[];
}

export const emptyReleaseContents: ReleaseContents = { strainRows: [], flushRows: [], seasonRows: [], dryingRows: [], regimeRows: [] };

/**
 * The separately published figures of one cell (species × strain × recipe × fruiting method):
 * block and contamination counts, days to first harvest, BE in each flush window, the flush
 * profile, the drying ratio. Each is checked on its own, as a farm can change one without the
 * others (blocks that have not fruited change the counts, a late flush changes BE over all
 * flushes only). The cell's BE season by season ("seasons:<window>") is one figure per window:
 * every season of the cell together, so its seasons always add up to the same release's BE of
 * the window. A climate regime's cell is species × regime kind, with its own two figures: rooms
 * and contamination, and room-mean BE.
 */
export const releaseFigureKinds = [
  "counts",
  "first-harvest",
  "efficiency:all",
  "efficiency:1-2",
  "efficiency:1",
  "flush-profile",
  "seasons:all",
  "seasons:1-2",
  "seasons:1",
  "drying",
  "regime:contamination",
  "regime:efficiency",
] as const;
export type ReleaseFigureKind = (typeof releaseFigureKinds)[number];

export const releaseFigureLabels: Record<ReleaseFigureKind, string> = {
  counts: "block and contamination counts",
  "first-harvest": "days to first harvest",
  "efficiency:all": "BE over all flushes",
  "efficiency:1-2": "BE over flushes 1–2",
  "efficiency:1": "BE of the first flush",
  "flush-profile": "flush profile",
  "seasons:all": "BE season by season over all flushes",
  "seasons:1-2": "BE season by season over flushes 1–2",
  "seasons:1": "BE season by season of the first flush",
  drying: "drying ratio",
  "regime:contamination": "rooms and contamination by climate regime",
  "regime:efficiency": "room-mean BE by climate regime",
};

export interface ReleaseCell {
  speciesId: string;
  strainId: string;
  substrateRecipeId: string | null;
  fruitingMethodId: string | null;
}

/** A figure whose change since the last release comes from too few farms: it keeps the last release's value. */
export type HeldBackFigure = { kind: ReleaseFigureKind; farmsChanged: number } & (
  (ReleaseCell & { regimeKindId?: undefined }) | { speciesId: string; regimeKindId: string }
);

export interface ReleasePlan {
  /** What the new release would hold. */
  next: ReleaseContents;
  /** Figures that take new values. */
  figuresChanged: number;
  heldBack: HeldBackFigure[];
  /** Farms whose data changed in any figure since the last release (published now or held back). */
  farmsChanged: number;
}

/** One farm's part of one figure, as numbers compared between releases; the first number says whether it contributes. */
type Vector = number[];

const sameNumber = (a: number, b: number) => a === b || Math.abs(a - b) <= 1e-9 * Math.max(1, Math.abs(a), Math.abs(b));

/** A farm with no part in a figure reads as an empty vector, whether its row is missing or all zeros. */
const normal = (vector: Vector | undefined): Vector => (vector && vector.some((value) => value !== 0) ? vector : []);

/** Equal within float noise: a refresh that sums the same harvests in another order must not count as a change. */
function sameVector(a: Vector | undefined, b: Vector | undefined): boolean {
  const x = normal(a);
  const y = normal(b);
  return x.length === y.length && x.every((value, index) => sameNumber(value, y[index]));
}

const contributes = (vector: Vector | undefined) => vector !== undefined && vector[0] > 0;

function cellKey(row: ReleaseCell): string {
  return `${row.speciesId}|${row.strainId}|${row.substrateRecipeId ?? ""}|${row.fruitingMethodId ?? ""}`;
}

function cellOf(key: string): ReleaseCell {
  const [speciesId, strainId, recipe, method] = key.split("|");
  return { speciesId, strainId, substrateRecipeId: recipe || null, fruitingMethodId: method || null };
}

// A regime's cell has no strain, recipe or method: its key cannot be mistaken for a strain cell's.
const regimePrefix = "regime#";
const regimeKey = (row: { speciesId: string; regimeKindId: string }) => `${regimePrefix}${row.speciesId}|${row.regimeKindId}`;

function regimeCellOf(key: string): { speciesId: string; regimeKindId: string } | null {
  if (!key.startsWith(regimePrefix)) return null;
  const [speciesId, regimeKindId] = key.slice(regimePrefix.length).split("|");
  return { speciesId, regimeKindId };
}

/** cell → figure kind → farm → vector */
type Figures = Map<string, Map<ReleaseFigureKind, Map<string, Vector>>>;

function put(figures: Figures, key: string, kind: ReleaseFigureKind, farmId: string, vector: Vector) {
  let kinds = figures.get(key);
  if (!kinds) figures.set(key, (kinds = new Map<ReleaseFigureKind, Map<string, Vector>>()));
  let farms = kinds.get(kind);
  if (!farms) kinds.set(kind, (farms = new Map<string, Vector>()));
  farms.set(farmId, vector);
}

function binsVector(bins: Record<string, number>): Vector {
  return Object.entries(bins)
    .filter(([, count]) => count > 0)
    .map(([bin, count]) => [Number(bin), count])
    .sort((a, b) => a[0] - b[0])
    .flat();
}

function figuresOf(contents: ReleaseContents): Figures {
  const figures: Figures = new Map();
  for (const row of contents.strainRows) {
    const key = cellKey(row);
    // Counts and days to first harvest are the same in every window's row: every block is in each.
    if (row.flushWindow === "all") {
      put(figures, key, "counts", row.farmId, [row.blocks, row.blocksContaminated]);
      put(figures, key, "first-harvest", row.farmId, [row.firstHarvestBlocks, row.firstHarvestDaysSum]);
    }
    put(figures, key, `efficiency:${row.flushWindow}`, row.farmId, [
      row.efficiencyBlocks,
      row.efficiencySum,
      row.efficiencySquares,
      ...binsVector(row.efficiencyBins),
    ]);
  }
  const flushes = new Map<string, ReleaseFlushRow[]>();
  for (const row of contents.flushRows) {
    const key = `${cellKey(row)}#${row.farmId}`;
    flushes.set(key, [...(flushes.get(key) ?? []), row]);
  }
  for (const rows of flushes.values()) {
    rows.sort((a, b) => a.flush - b.flush);
    const vector = [
      Math.max(...rows.map((row) => row.finishedBlocks)),
      ...rows.flatMap((row) => [
        row.flush,
        row.finishedBlocks,
        row.blocksFruiting,
        row.shareSum,
        row.shareSquares,
        row.cumulativeSum,
        row.cumulativeSquares,
      ]),
    ];
    put(figures, cellKey(rows[0]), "flush-profile", rows[0].farmId, vector);
  }
  const seasons = new Map<string, ReleaseSeasonRow[]>();
  for (const row of contents.seasonRows) {
    const key = `${cellKey(row)}#${row.farmId}#${row.flushWindow}`;
    seasons.set(key, [...(seasons.get(key) ?? []), row]);
  }
  for (const rows of seasons.values()) {
    rows.sort((a, b) => (a.seasonYear ?? noSeason) - (b.seasonYear ?? noSeason));
    // Blocks with a BE in any season first (whether the farm contributes), then season, n, Σ, Σ² per season.
    const vector = [
      rows.reduce((sum, row) => sum + row.efficiencyBlocks, 0),
      ...rows.flatMap((row) => [row.seasonYear ?? noSeason, row.efficiencyBlocks, row.efficiencySum, row.efficiencySquares]),
    ];
    put(figures, cellKey(rows[0]), `seasons:${rows[0].flushWindow}`, rows[0].farmId, vector);
  }
  for (const row of contents.dryingRows)
    put(figures, cellKey(row), "drying", row.farmId, [row.driedBlocks, row.ratioSum, row.ratioSquares]);
  for (const row of contents.regimeRows) {
    const key = regimeKey(row);
    put(figures, key, "regime:contamination", row.farmId, [
      row.rooms,
      row.blocks,
      row.blocksContaminated,
      row.contaminationRoomSum,
      row.contaminationRoomSquares,
    ]);
    put(figures, key, "regime:efficiency", row.farmId, [
      row.efficiencyRooms,
      row.efficiencyRoomSum,
      row.efficiencyRoomSquares,
      row.efficiencyBlocks,
      row.blockEfficiencySum,
      row.blockEfficiencySquares,
      row.roomWeightedSquares,
      row.roomSizeSquares,
    ]);
  }
  return figures;
}

/** A block with neither a season nor an inoculation date, as a vector holds it. */
const noSeason = -1;

function contentsOf(figures: Figures): ReleaseContents {
  const strainRows: ReleaseStrainRow[] = [];
  const flushRows: ReleaseFlushRow[] = [];
  const seasonRows: ReleaseSeasonRow[] = [];
  const dryingRows: ReleaseDryingRow[] = [];
  const regimeRows: RegimeStatisticsRow[] = [];
  for (const [key, kinds] of figures) {
    const farms = new Set([...kinds.values()].flatMap((byFarm) => [...byFarm.keys()]));
    const regime = regimeCellOf(key);
    if (regime) {
      for (const farmId of farms) {
        const counts = kinds.get("regime:contamination")?.get(farmId) ?? [0, 0, 0, 0, 0];
        const efficiency = kinds.get("regime:efficiency")?.get(farmId) ?? [0, 0, 0, 0, 0, 0, 0, 0];
        regimeRows.push({
          ...regime,
          farmId,
          rooms: counts[0],
          blocks: counts[1],
          blocksContaminated: counts[2],
          contaminationRoomSum: counts[3],
          contaminationRoomSquares: counts[4],
          efficiencyRooms: efficiency[0],
          efficiencyRoomSum: efficiency[1],
          efficiencyRoomSquares: efficiency[2],
          efficiencyBlocks: efficiency[3],
          blockEfficiencySum: efficiency[4],
          blockEfficiencySquares: efficiency[5],
          roomWeightedSquares: efficiency[6],
          roomSizeSquares: efficiency[7],
        });
      }
      continue;
    }
    const cell = cellOf(key);
    for (const farmId of farms) {
      const drying = kinds.get("drying")?.get(farmId);
      if (drying && drying[0] > 0) {
        dryingRows.push({ ...cell, farmId, driedBlocks: drying[0], ratioSum: drying[1], ratioSquares: drying[2] });
      }
      const counts = kinds.get("counts")?.get(farmId) ?? [0, 0];
      const first = kinds.get("first-harvest")?.get(farmId) ?? [0, 0];
      for (const window of flushWindows) {
        const efficiency = kinds.get(`efficiency:${window}`)?.get(farmId) ?? [0, 0, 0];
        if (counts[0] === 0 && first[0] === 0 && efficiency[0] === 0) continue;
        const bins: Record<string, number> = {};
        for (let index = 3; index < efficiency.length; index += 2) bins[String(efficiency[index])] = efficiency[index + 1];
        strainRows.push({
          ...cell,
          farmId,
          flushWindow: window,
          blocks: counts[0],
          blocksContaminated: counts[1],
          firstHarvestBlocks: first[0],
          firstHarvestDaysSum: first[1],
          efficiencyBlocks: efficiency[0],
          efficiencySum: efficiency[1],
          efficiencySquares: efficiency[2],
          efficiencyBins: bins,
        });
      }
      for (const window of flushWindows) {
        const seasons = kinds.get(`seasons:${window}`)?.get(farmId);
        if (!seasons || seasons[0] === 0) continue;
        for (let index = 1; index < seasons.length; index += 4) {
          seasonRows.push({
            ...cell,
            farmId,
            flushWindow: window,
            seasonYear: seasons[index] === noSeason ? null : seasons[index],
            efficiencyBlocks: seasons[index + 1],
            efficiencySum: seasons[index + 2],
            efficiencySquares: seasons[index + 3],
          });
        }
      }
      const profile = kinds.get("flush-profile")?.get(farmId);
      if (!profile || profile[0] === 0) continue;
      for (let index = 1; index < profile.length; index += 7) {
        flushRows.push({
          ...cell,
          farmId,
          flush: profile[index],
          finishedBlocks: profile[index + 1],
          blocksFruiting: profile[index + 2],
          shareSum: profile[index + 3],
          shareSquares: profile[index + 4],
          cumulativeSum: profile[index + 5],
          cumulativeSquares: profile[index + 6],
        });
      }
    }
  }
  return { strainRows, flushRows, seasonRows, dryingRows, regimeRows };
}

/** The BE figure a cell's season breakdown must move with, so that its seasons add up to the BE published beside it. */
const seasonsFollow: Partial<Record<ReleaseFigureKind, ReleaseFigureKind>> = {
  "seasons:all": "efficiency:all",
  "seasons:1-2": "efficiency:1-2",
  "seasons:1": "efficiency:1",
};

/**
 * Plans the next release from the last one and the live statistics, figure by figure (cell ×
 * kind), so that every release holds and every step between two consecutive releases reveals
 * only sums over at least `minimumFarms` farms:
 * 1. A figure to which fewer than the minimum number of farms contribute now is left out
 *    (as if no farm had data there).
 * 2. If the farms whose part of the figure differs from the last release are none, the figure
 *    keeps the last release's value; if they are at least the minimum, it takes the new value;
 *    otherwise it keeps the last release's value and is reported as held back, until enough
 *    farms have changed it.
 * By induction every figure in every release has either no farm or at least the minimum behind
 * it, and differs from the previous release by the data of no farm or of at least the minimum.
 * 3. A cell's BE season by season is held back while the cell's BE of the same window is: the two
 *    cover the same blocks, and a breakdown moved on beside a BE held back would publish, as
 *    their difference, the change of the few farms that held the BE back.
 */
export function planRelease(previous: ReleaseContents, live: ReleaseContents, minimumFarms: number): ReleasePlan {
  const before = figuresOf(previous);
  const now = figuresOf(live);
  const next: Figures = new Map();
  const heldBack: HeldBackFigure[] = [];
  const farmsChanged = new Set<string>();
  let figuresChanged = 0;
  for (const key of new Set([...before.keys(), ...now.keys()])) {
    const heldKinds = new Set<ReleaseFigureKind>();
    for (const kind of releaseFigureKinds) {
      const old = before.get(key)?.get(kind) ?? new Map<string, Vector>();
      let candidate = now.get(key)?.get(kind) ?? new Map<string, Vector>();
      const contributing = [...candidate.values()].filter(contributes).length;
      if (contributing > 0 && contributing < minimumFarms) candidate = new Map();
      const changed = [...new Set([...old.keys(), ...candidate.keys()])].filter(
        (farmId) => !sameVector(old.get(farmId), candidate.get(farmId)),
      );
      for (const farmId of changed) farmsChanged.add(farmId);
      const follows = seasonsFollow[kind];
      const held = changed.length > 0 && (changed.length < minimumFarms || (follows !== undefined && heldKinds.has(follows)));
      const kept = changed.length === 0 || held ? old : candidate;
      if (held) {
        heldKinds.add(kind);
        heldBack.push({ ...(regimeCellOf(key) ?? cellOf(key)), kind, farmsChanged: changed.length });
      }
      if (kept === candidate && changed.length > 0) figuresChanged++;
      for (const [farmId, vector] of kept) if (normal(vector).length > 0) put(next, key, kind, farmId, vector);
    }
  }
  return { next: contentsOf(next), figuresChanged, heldBack, farmsChanged: farmsChanged.size };
}

/** The live statistics keep one row per trial arm; a release adds a farm's arms together (bins included). */
export function addTrialArms(rows: readonly ReleaseStrainRow[]): ReleaseStrainRow[] {
  const merged = new Map<string, ReleaseStrainRow>();
  for (const row of rows) {
    const key = `${cellKey(row)}|${row.farmId}|${row.flushWindow}`;
    const seen = merged.get(key);
    if (!seen) {
      merged.set(key, { ...row, efficiencyBins: { ...row.efficiencyBins } });
      continue;
    }
    seen.blocks += row.blocks;
    seen.blocksContaminated += row.blocksContaminated;
    seen.efficiencyBlocks += row.efficiencyBlocks;
    seen.efficiencySum += row.efficiencySum;
    seen.efficiencySquares += row.efficiencySquares;
    seen.firstHarvestBlocks += row.firstHarvestBlocks;
    seen.firstHarvestDaysSum += row.firstHarvestDaysSum;
    for (const [bin, count] of Object.entries(row.efficiencyBins)) seen.efficiencyBins[bin] = (seen.efficiencyBins[bin] ?? 0) + count;
  }
  return [...merged.values()];
}
