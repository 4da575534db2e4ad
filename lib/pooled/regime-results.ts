import { meanCIFromSummary, StatsInputError, wilsonInterval } from "@/lib/stats";
import { blockedModelFromCells } from "./cell-models";
import { suppressedMessage } from "./privacy";
import type { Interval, Published } from "./results";
import { addSummaries, emptySummary, summaryMean, summaryVariance, type Summary } from "./sufficient";
import type { RegimeStatisticsRow } from "./types";

export interface RegimeResult {
  regimeKindId: string;
  regimeName: string;
  /** Farms and rooms (a room while it ran this regime) behind the contamination figures. */
  farms: Published<number>;
  rooms: Published<number>;
  /** Percent: blocks contaminated over all of the regime's rooms (Wilson interval), and the plain mean of the rooms' own rates. */
  contamination: Published<Interval & { meanRoomRate: number }>;
  /** BE points: least-squares mean of room means with farm as block (or the plain mean of room means when the model cannot be fitted). */
  efficiency: Published<Interval & { adjustedForFarm: boolean; farms: number; rooms: number }>;
}

export interface RegimeDifference extends Interval {
  regimeA: string;
  regimeB: string;
  pAdjusted: number;
}

export interface RegimeComparison {
  minimumFarms: number;
  regimes: RegimeResult[];
  /** Room-mean BE ~ regime + farm: the F test of the regimes and every pair's difference (B − A), Tukey-adjusted. */
  model: Published<{ f: number; dfRegime: number; dfResidual: number; p: number; differences: RegimeDifference[] }>;
}

const published = <T>(value: T): Published<T> => ({ status: "published", value });
const suppressed = <T>(message: string): Published<T> => ({ status: "suppressed", message });

/**
 * Contamination and BE by climate regime for one species, with the room as the unit, from per-farm
 * sums (RegimeStatisticsRow). Each regime's figures are published only where the minimum number of
 * farms contribute to them (farms with rooms for contamination, farms with a room-mean BE for BE);
 * the model and its differences only among regimes whose BE is published. Nothing per farm or per
 * room leaves: counts of farms and rooms, means and intervals.
 */
export function buildRegimeComparison(input: {
  rows: readonly RegimeStatisticsRow[];
  regimes: readonly { id: string; name: string }[];
  minimumFarms: number;
  level?: number;
}): RegimeComparison {
  const { minimumFarms } = input;
  const level = input.level ?? 0.95;
  const few = suppressedMessage(minimumFarms);
  const names = new Map(input.regimes.map((regime) => [regime.id, regime.name]));
  const byRegime = new Map<string, RegimeStatisticsRow[]>();
  for (const row of input.rows) byRegime.set(row.regimeKindId, [...(byRegime.get(row.regimeKindId) ?? []), row]);
  const ordered = [...byRegime.entries()].sort(([a], [b]) => (names.get(a) ?? "").localeCompare(names.get(b) ?? "") || a.localeCompare(b));

  // Regimes whose room-mean BE is published enter the blocked model, fitted once, in name order.
  const efficiencyFarms = (rows: readonly RegimeStatisticsRow[]) => rows.filter((row) => row.efficiencyRooms > 0).length;
  const comparable = ordered.filter(([, rows]) => efficiencyFarms(rows) >= minimumFarms);
  const cells = comparable.flatMap(([regimeKindId, rows]) =>
    rows
      .filter((row) => row.efficiencyRooms > 0)
      .map((row) => ({
        treatment: regimeKindId,
        block: row.farmId,
        n: row.efficiencyRooms,
        sum: row.efficiencyRoomSum,
        squares: row.efficiencyRoomSquares,
      })),
  );
  let fit: ReturnType<typeof blockedModelFromCells> | null = null;
  let modelProblem = `needs at least two climate regimes each run on ${minimumFarms} or more farms`;
  if (comparable.length >= 2) {
    try {
      fit = blockedModelFromCells(cells, level);
    } catch (error) {
      if (!(error instanceof StatsInputError)) throw error;
      modelProblem = error.message;
    }
  }
  const adjusted = new Map(fit?.means.map((mean) => [mean.treatment, mean]) ?? []);

  const regimes = ordered.map(([regimeKindId, rows]): RegimeResult => {
    const roomFarms = rows.filter((row) => row.rooms > 0).length;
    const rooms = rows.reduce((sum, row) => sum + row.rooms, 0);
    const blocks = rows.reduce((sum, row) => sum + row.blocks, 0);
    const contaminated = rows.reduce((sum, row) => sum + row.blocksContaminated, 0);
    const countsPublished = roomFarms >= minimumFarms && blocks > 0;
    const wilson = countsPublished ? wilsonInterval(contaminated, blocks, level) : null;

    const beFarms = efficiencyFarms(rows);
    const roomMeans = rows.reduce<Summary>(
      (sum, row) => addSummaries(sum, { n: row.efficiencyRooms, sum: row.efficiencyRoomSum, squares: row.efficiencyRoomSquares }),
      emptySummary,
    );
    let efficiency: RegimeResult["efficiency"] = suppressed(few);
    const fromModel = adjusted.get(regimeKindId);
    if (beFarms >= minimumFarms && fromModel) {
      efficiency = published({
        estimate: fromModel.estimate,
        lower: fromModel.lower,
        upper: fromModel.upper,
        adjustedForFarm: true,
        farms: beFarms,
        rooms: roomMeans.n,
      });
    } else if (beFarms >= minimumFarms && roomMeans.n >= 2) {
      const plain = meanCIFromSummary({ n: roomMeans.n, mean: summaryMean(roomMeans), sd: Math.sqrt(summaryVariance(roomMeans)) }, level);
      efficiency = published({
        estimate: plain.mean,
        lower: plain.lower,
        upper: plain.upper,
        adjustedForFarm: false,
        farms: beFarms,
        rooms: roomMeans.n,
      });
    }
    return {
      regimeKindId,
      regimeName: names.get(regimeKindId) ?? "A climate regime no longer in the register",
      farms: countsPublished ? published(roomFarms) : suppressed(few),
      rooms: countsPublished ? published(rooms) : suppressed(few),
      contamination: wilson
        ? published({
            estimate: 100 * wilson.p,
            lower: 100 * wilson.lower,
            upper: 100 * wilson.upper,
            meanRoomRate: (100 * rows.reduce((sum, row) => sum + row.contaminationRoomSum, 0)) / rooms,
          })
        : suppressed(few),
      efficiency,
    };
  });

  const model: RegimeComparison["model"] = fit
    ? published({
        f: fit.treatment.f,
        dfRegime: fit.treatment.df,
        dfResidual: fit.residual.df,
        p: fit.treatment.p,
        // The model gives mean(a) − mean(b) with a before b in name order; the table reads "b − a".
        differences: fit.comparisons.map((comparison) => ({
          regimeA: names.get(comparison.a) ?? "A climate regime no longer in the register",
          regimeB: names.get(comparison.b) ?? "A climate regime no longer in the register",
          estimate: -comparison.difference,
          lower: -comparison.upper,
          upper: -comparison.lower,
          pAdjusted: comparison.pAdjusted,
        })),
      })
    : suppressed(modelProblem);
  return { minimumFarms, regimes, model };
}

/**
 * The co-op's intraclass correlation of block BE within rooms, from the released per-farm sums:
 * the one-way estimator of lib/stats `intraclassCorrelation` with rooms compared within each farm ×
 * regime (so neither farm nor regime differences count as room clustering), computed from Σy, Σy²,
 * Σ nᵢȳᵢ² and Σ nᵢ² alone. Published, to 0.01, only where at least the minimum number of farms have
 * two or more rooms of one regime with a BE; otherwise null. Negative estimates count as 0, as for
 * planning.
 */
export function pooledRoomIcc(
  rows: readonly RegimeStatisticsRow[],
  minimumFarms: number,
): { icc: number; farms: number; rooms: number } | null {
  let ssWithin = 0;
  let ssBetween = 0;
  let dfWithin = 0;
  let dfBetween = 0;
  let blocks = 0;
  let squaredSizes = 0;
  let rooms = 0;
  const farms = new Set<string>();
  for (const row of rows) {
    if (row.efficiencyRooms < 2 || row.efficiencyBlocks === 0) continue;
    farms.add(row.farmId);
    ssWithin += Math.max(0, row.blockEfficiencySquares - row.roomWeightedSquares);
    ssBetween += Math.max(0, row.roomWeightedSquares - (row.blockEfficiencySum * row.blockEfficiencySum) / row.efficiencyBlocks);
    dfWithin += row.efficiencyBlocks - row.efficiencyRooms;
    dfBetween += row.efficiencyRooms - 1;
    blocks += row.efficiencyBlocks;
    squaredSizes += row.roomSizeSquares / row.efficiencyBlocks;
    rooms += row.efficiencyRooms;
  }
  if (farms.size < minimumFarms || dfBetween < 1 || dfWithin < 1) return null;
  const msBetween = ssBetween / dfBetween;
  const msWithin = ssWithin / dfWithin;
  const m0 = (blocks - squaredSizes) / dfBetween;
  const denominator = msBetween + (m0 - 1) * msWithin;
  if (!(denominator > 0)) return null;
  return { icc: Math.max(0, (msBetween - msWithin) / denominator), farms: farms.size, rooms };
}
