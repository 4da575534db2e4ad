import { blockedAnova, type BlockedAnova } from "./blocked-anova";
import { accurateMean, isRoundingNoise } from "./describe";
import { StatsInputError, requireFinite, requireLevel } from "./errors";
import { sampleSizePairwiseBlocked } from "./sample-size";

// Trials whose unit is the fruiting room: a climate regime applies to a whole room, so the room, not
// the block, is randomised and analysed. Blocks in one room are alike (they share its air), which the
// intraclass correlation measures and the design effect turns into extra blocks.

/**
 * Design effect of putting m blocks in each randomised room: 1 + (m − 1)·ICC, the factor by which
 * a room-randomised trial needs more blocks than one that randomises blocks (Kerry & Bland 1998,
 * BMJ 316:1455; Donner & Klar 2000). Dimensionless. Rooms of unequal size: use the mean size.
 */
export function designEffect(blocksPerRoom: number, icc: number): number {
  requireFinite(blocksPerRoom, "The number of blocks per room");
  requireFinite(icc, "The intraclass correlation");
  if (!(blocksPerRoom >= 1)) {
    throw new StatsInputError("invalid_argument", `Blocks per room is ${blocksPerRoom}; a room holds at least 1 block.`);
  }
  if (!(icc >= 0 && icc < 1)) {
    throw new StatsInputError(
      "invalid_argument",
      `The intraclass correlation ${icc} must be from 0 up to (not including) 1; an estimate below 0 counts as 0 for planning.`,
    );
  }
  return 1 + (blocksPerRoom - 1) * icc;
}

export type RoomBlock = {
  /** The room's name, unique within its farm. */
  room: string;
  /** The farm the room belongs to; rooms are compared only with rooms of their own farm. Optional for a single farm. */
  farm?: string;
  /** The block's outcome, e.g. BE in percent. */
  y: number;
};

export type IntraclassCorrelation = {
  /** The one-way ANOVA estimate (MSB − MSW)/(MSB + (m₀ − 1)·MSW); can fall below 0 by chance. */
  icc: number;
  /** max(0, icc): what a design effect should use. */
  forPlanning: number;
  /** Mean square between rooms within farms, and its degrees of freedom (rooms − farms). */
  msBetween: number;
  dfBetween: number;
  /** Mean square between blocks within rooms, and its degrees of freedom (blocks − rooms). */
  msWithin: number;
  dfWithin: number;
  /** The "average" room size of the expected mean square; the plain mean when rooms are equal. */
  m0: number;
  rooms: number;
  blocks: number;
};

/**
 * How alike blocks in one room are: the intraclass correlation by the one-way analysis-of-variance
 * estimator, ρ̂ = (MSB − MSW)/(MSB + (m₀ − 1)·MSW) with m₀ = (N − Σ nᵢ²/N)/(k − 1) for k rooms of
 * nᵢ blocks (Donner 1986, Int Stat Rev 54:67–82; for equal rooms it is Shrout & Fleiss's 1979
 * ICC(1,1)). With farms given, rooms are compared within their farm (farm differences are not room
 * clustering, as the room-mean analysis blocks them out): MSB is then between rooms within farms,
 * on rooms − farms df, and m₀ = (N − Σ nᵢ²/N_f(i))/(rooms − farms), from the same expected mean square.
 */
export function intraclassCorrelation(blocks: RoomBlock[]): IntraclassCorrelation {
  const farms = new Map<string, { size: number; sum: number }>();
  const rooms = new Map<string, { farm: { size: number; sum: number }; values: number[] }>();
  blocks.forEach((block, i) => {
    requireFinite(block.y, `Block ${i + 1} (room "${block.room}")`);
    let farm = farms.get(block.farm ?? "");
    if (!farm) farms.set(block.farm ?? "", (farm = { size: 0, sum: 0 }));
    farm.size++;
    const key = `${block.farm ?? ""}\u0000${block.room}`;
    const room = rooms.get(key) ?? { farm, values: [] };
    room.values.push(block.y);
    rooms.set(key, room);
  });
  const total = blocks.length;
  const dfBetween = rooms.size - farms.size;
  const dfWithin = total - rooms.size;
  if (dfBetween < 1 || dfWithin < 1) {
    throw new StatsInputError(
      "too_few_values",
      "Estimating how alike blocks in a room are needs at least two rooms on a farm and a room with two or more blocks.",
    );
  }
  let ssWithin = 0;
  const roomMeans: { farm: { size: number; sum: number }; n: number; mean: number }[] = [];
  for (const { farm, values } of rooms.values()) {
    const mean = accurateMean(values);
    for (const y of values) ssWithin += (y - mean) ** 2;
    roomMeans.push({ farm, n: values.length, mean });
    farm.sum += values.length * mean;
  }
  let ssBetween = 0;
  let squaredSizes = 0;
  for (const { farm, n, mean } of roomMeans) {
    ssBetween += n * (mean - farm.sum / farm.size) ** 2;
    squaredSizes += (n * n) / farm.size;
  }
  const msBetween = ssBetween / dfBetween;
  const msWithin = ssWithin / dfWithin;
  const m0 = (total - squaredSizes) / dfBetween;
  const denominator = msBetween + (m0 - 1) * msWithin;
  if (
    isRoundingNoise(
      ssWithin + ssBetween,
      blocks.map((block) => block.y),
    ) ||
    !(denominator > 0)
  ) {
    throw new StatsInputError(
      "no_variation",
      "Every block in these rooms has the same value, so there is nothing to correlate; check the data.",
    );
  }
  const icc = (msBetween - msWithin) / denominator;
  return { icc, forPlanning: Math.max(0, icc), msBetween, dfBetween, msWithin, dfWithin, m0, rooms: rooms.size, blocks: total };
}

export type RoomSampleSize = {
  designEffect: number;
  /** SD of a room's mean BE: sd·√(design effect / blocks per room), in the outcome's unit. */
  roomMeanSd: number;
  /** Rooms per regime (arm), exact and rounded up. */
  roomsPerArm: number;
  roomsPerArmCeil: number;
  /** Blocks per arm that randomising blocks instead of rooms would need, for comparison (same test, same farms). */
  blocksPerArmIfBlocksRandomised: number;
};

/**
 * Rooms per regime for a trial that randomises rooms to regimes within each farm and analyses room
 * means with farm as block (roomMeanAnalysis): the room mean's variance is σ²·(1 + (m − 1)·ICC)/m,
 * so it is sampleSizePairwiseBlocked on room means (Tukey over every pair of regimes, farms as
 * blocks). With two regimes on one farm it is R's power.t.test on room means. `sd` is the spread of
 * BE between blocks of one regime on one farm, rooms included; `delta` in the same unit.
 */
export function roomsPerArm(options: {
  delta: number;
  sd: number;
  blocksPerRoom: number;
  icc: number;
  arms?: number;
  farms?: number;
  power?: number;
  alpha?: number;
}): RoomSampleSize {
  const { delta, sd, blocksPerRoom, icc, arms = 2, farms = 1, power = 0.8, alpha = 0.05 } = options;
  const effect = designEffect(blocksPerRoom, icc);
  if (!(sd > 0)) {
    throw new StatsInputError("invalid_argument", `The standard deviation ${sd} must be above 0; use the spread seen between blocks.`);
  }
  const roomMeanSd = sd * Math.sqrt(effect / blocksPerRoom);
  const rooms = sampleSizePairwiseBlocked({ delta, sd: roomMeanSd, arms, farms, power, alpha });
  const blocksOnly = sampleSizePairwiseBlocked({ delta, sd, arms, farms, power, alpha });
  return {
    designEffect: effect,
    roomMeanSd,
    roomsPerArm: rooms.nPerGroup,
    roomsPerArmCeil: rooms.nPerGroupCeil,
    blocksPerArmIfBlocksRandomised: blocksOnly.nPerGroup,
  };
}

export type RoomObservation = {
  farm: string;
  /** Unique within its farm. */
  room: string;
  /** The regime (or other room-level treatment) the room ran under. */
  treatment: string;
  /** One block's outcome, e.g. BE in percent. */
  y: number;
};

export type RoomMeanAnalysis = {
  /** Each room's mean outcome (equal weight for every block in it) and its number of blocks. */
  rooms: { farm: string; room: string; treatment: string; blocks: number; mean: number }[];
  /** blockedAnova on the room means: treatment + farm, comparisons Tukey-adjusted. */
  analysis: BlockedAnova;
};

/**
 * The analysis of a trial whose unit is the room: each room's blocks are averaged, and the room
 * means are compared across treatments with farm as block (blockedAnova), so the error is the
 * room-to-room spread, not the block-to-block spread within rooms. Each room must have run under
 * one treatment. Every room mean counts once, whatever its number of blocks.
 */
export function roomMeanAnalysis(observations: RoomObservation[], level = 0.95): RoomMeanAnalysis {
  requireLevel(level);
  const rooms = new Map<string, { farm: string; room: string; treatment: string; values: number[] }>();
  observations.forEach((o, i) => {
    requireFinite(o.y, `Block ${i + 1} (room "${o.room}" on farm "${o.farm}")`);
    const key = `${o.farm}\u0000${o.room}`;
    const entry = rooms.get(key) ?? { farm: o.farm, room: o.room, treatment: o.treatment, values: [] };
    if (entry.treatment !== o.treatment) {
      throw new StatsInputError(
        "invalid_argument",
        `Room "${o.room}" on farm "${o.farm}" has blocks under "${entry.treatment}" and "${o.treatment}"; in a room-level trial each room runs one treatment.`,
      );
    }
    entry.values.push(o.y);
    rooms.set(key, entry);
  });
  const means = [...rooms.values()].map(({ farm, room, treatment, values }) => ({
    farm,
    room,
    treatment,
    blocks: values.length,
    mean: accurateMean(values),
  }));
  return {
    rooms: means,
    analysis: blockedAnova(
      means.map((room) => ({ treatment: room.treatment, block: room.farm, y: room.mean })),
      level,
    ),
  };
}
