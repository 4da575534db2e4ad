import { roomOn } from "@/lib/rooms/regimes";
import { StatsInputError, intraclassCorrelation, roomMeanAnalysis, type AnovaTerm } from "@/lib/stats";
import { count } from "@/lib/words";

import { laterAgainstEarlier, plainAnswer, type Difference, type OutcomeRecord, type TrialArmInfo } from "./analysis";

/** A block's move into a room, as block_room_moves holds it (null day = from the start of fruiting). */
export interface TrialBlockMove {
  blockId: string;
  roomId: string;
  movedOn: string | null;
}

/**
 * The room each trial block fruited in: its room on the day of its first harvest (roomOn over its
 * moves), or, with no harvest yet, the room it was last moved to. Null when the farm never placed it.
 */
export function trialBlockRooms(
  moves: readonly TrialBlockMove[],
  harvests: readonly { blockId: string; harvestedOn: string | null }[],
): Map<string, string | null> {
  const movesOf = new Map<string, TrialBlockMove[]>();
  for (const move of moves) movesOf.set(move.blockId, [...(movesOf.get(move.blockId) ?? []), move]);
  const firstHarvest = new Map<string, string>();
  for (const { blockId, harvestedOn } of harvests) {
    if (!harvestedOn) continue;
    const seen = firstHarvest.get(blockId);
    if (!seen || harvestedOn < seen) firstHarvest.set(blockId, harvestedOn);
  }
  const rooms = new Map<string, string | null>();
  for (const [blockId, own] of movesOf) {
    rooms.set(blockId, roomOn(own, firstHarvest.get(blockId) ?? "9999-12-31")?.roomId ?? null);
  }
  return rooms;
}

/** A block's outcome with the room it fruited in (an opaque key, never a name), null when it was placed in none. */
export interface RoomOutcomeRecord extends OutcomeRecord {
  room: string | null;
}

/** What a room-level trial's report publishes: figures over rooms, none of one room or one farm. */
export interface PublishedRoomAnalysis {
  unit: "room";
  /** Rooms analysed per arm; null where fewer than the minimum number of farms ran the arm. */
  roomsPerArm: { label: string; rooms: number | null }[];
  /** Blocks in one room alike to this intraclass correlation (rooms within farm and arm), to 0.01; null when it could not be estimated or too few farms reported. */
  iccObserved: number | null;
  /** The room-mean analysis: arm + farm on room means. */
  anova: { arm: AnovaTerm; farm: AnovaTerm; residualDf: number } | null;
  adjustedMeans: { treatment: string; estimate: number; lower: number; upper: number }[];
  versusReference: Difference[];
  betweenArms: Difference[];
  roomsAnalysed: number | null;
  notes: string[];
  answer: string;
}

const withheldNote = (labels: string[], minimumFarms: number) =>
  `Arm${labels.length === 1 ? "" : "s"} ${labels.join(", ")}: run on fewer than ${minimumFarms} farms, so ${labels.length === 1 ? "its" : "their"} figures are not published.`;

/**
 * The pre-declared analysis of a trial whose unit is the fruiting room (roomMeanAnalysis): each
 * room's counted blocks are averaged and the room means compared with farm as block, so the error
 * is the spread between rooms, not between blocks sharing a room's air. Published only as the
 * co-op publishes any trial: nothing below the minimum number of farms for the trial, no figure of
 * an arm run on fewer farms, no room's own mean (only counts of rooms, adjusted means over farms,
 * differences and the observed ICC). A room holding blocks of two arms breaks the design and is
 * left out with a note, as are blocks placed in no room.
 */
export function analyseRoomTrial(input: {
  arms: readonly TrialArmInfo[];
  records: readonly RoomOutcomeRecord[];
  minimumFarms: number;
}): PublishedRoomAnalysis {
  const { arms, minimumFarms } = input;
  const reference = arms.find((arm) => arm.isReference) ?? arms[0];
  const ordered = [reference, ...arms.filter((arm) => arm.id !== reference.id)];
  const labelOf = new Map(arms.map((arm) => [arm.id, arm.label]));
  const counted = input.records.filter(
    (record): record is RoomOutcomeRecord & { value: number } => record.value !== null && labelOf.has(record.armId),
  );
  const notes: string[] = [];
  const unplaced = counted.filter((record) => record.room === null).length;
  const roomKey = (record: RoomOutcomeRecord) => `${record.farm}\u0000${record.room}`;
  const armsOfRoom = new Map<string, Set<string>>();
  for (const record of counted) {
    if (record.room === null) continue;
    const key = roomKey(record);
    armsOfRoom.set(key, (armsOfRoom.get(key) ?? new Set()).add(record.armId));
  }
  const mixed = new Set([...armsOfRoom].filter(([, armIds]) => armIds.size > 1).map(([key]) => key));
  const usable = counted.filter((record) => record.room !== null && !mixed.has(roomKey(record)));
  const farms = new Set(usable.map((record) => record.farm));
  const enough = farms.size >= minimumFarms;

  const empty = (answer: string): PublishedRoomAnalysis => ({
    unit: "room",
    roomsPerArm: ordered.map((arm) => ({ label: arm.label, rooms: null })),
    iccObserved: null,
    anova: null,
    adjustedMeans: [],
    versusReference: [],
    betweenArms: [],
    roomsAnalysed: null,
    notes,
    answer,
  });
  if (!enough) {
    notes.push(
      `Only ${count(farms.size, "farm")} reported rooms with counted blocks; the co-op shows pooled figures only from ${minimumFarms} farms up.`,
    );
    return empty(`No answer yet: ${count(farms.size, "farm")} reported, and the co-op needs ${minimumFarms} before it pools.`);
  }
  if (unplaced)
    notes.push(`${count(unplaced, "counted block")} had no fruiting room recorded, so ${unplaced === 1 ? "it is" : "they are"} left out.`);
  if (mixed.size)
    notes.push(
      `${count(mixed.size, "room")} held blocks of more than one arm, against the design (a room runs its arm's regime), so ${mixed.size === 1 ? "it is" : "they are"} left out.`,
    );

  const roomsOfArm = (armId: string) => new Set(usable.filter((record) => record.armId === armId).map(roomKey)).size;
  const farmsOfArm = (armId: string) => new Set(usable.filter((record) => record.armId === armId).map((record) => record.farm)).size;
  const withheld = ordered.filter((arm) => farmsOfArm(arm.id) < minimumFarms).map((arm) => arm.label);
  const shown = (label: string) => !withheld.includes(label);
  if (withheld.length) notes.push(withheldNote(withheld, minimumFarms));

  let iccObserved: number | null = null;
  try {
    // Rooms compared within farm and arm: differences between regimes are not room clustering.
    const icc = intraclassCorrelation(
      usable.map((record) => ({ farm: `${record.farm}\u0000${record.armId}`, room: record.room!, y: record.value })),
    );
    iccObserved = Math.round(icc.icc * 100) / 100;
  } catch (error) {
    if (!(error instanceof StatsInputError)) throw error;
    notes.push(`How alike blocks in one room were could not be estimated: ${error.message}`);
  }

  let anova: PublishedRoomAnalysis["anova"] = null;
  let adjustedMeans: PublishedRoomAnalysis["adjustedMeans"] = [];
  let pairs: Difference[] = [];
  try {
    const order = new Map(ordered.map((arm, index) => [arm.id, index]));
    const inArmOrder = [...usable].sort((a, b) => order.get(a.armId)! - order.get(b.armId)!);
    const fit = roomMeanAnalysis(
      inArmOrder.map((record) => ({ farm: record.farm, room: record.room!, treatment: labelOf.get(record.armId)!, y: record.value })),
    ).analysis;
    anova = { arm: fit.treatment, farm: fit.block, residualDf: fit.residual.df };
    adjustedMeans = fit.means.filter((mean) => shown(mean.treatment));
    pairs = laterAgainstEarlier(fit.comparisons).filter((pair) => shown(pair.arm) && shown(pair.versus));
  } catch (error) {
    if (!(error instanceof StatsInputError)) throw error;
    notes.push(`The room-mean analysis could not be fitted, so the arms are not compared: ${error.message}`);
  }
  const versusReference = pairs.filter((pair) => pair.versus === reference.label);
  return {
    unit: "room",
    roomsPerArm: ordered.map((arm) => ({ label: arm.label, rooms: shown(arm.label) ? roomsOfArm(arm.id) : null })),
    iccObserved,
    anova,
    adjustedMeans,
    versusReference,
    betweenArms: pairs.filter((pair) => pair.versus !== reference.label),
    roomsAnalysed: new Set(usable.map(roomKey)).size,
    notes,
    answer: plainAnswer(arms, reference.label, versusReference, true, farms.size, minimumFarms),
  };
}

/** The report's sentence on the unit: what was compared and how many rooms each arm had. */
export function roomUnitSentence(rooms: PublishedRoomAnalysis): string {
  const perArm = rooms.roomsPerArm
    .filter((arm) => arm.rooms !== null)
    .map((arm) => `arm ${arm.label} ${count(arm.rooms!, "room")}`)
    .join(", ");
  const icc =
    rooms.iccObserved === null
      ? ""
      : ` Blocks sharing a room were alike to an intraclass correlation of ${rooms.iccObserved.toFixed(2)} (observed in this trial).`;
  return `The unit of this trial is the fruiting room: rooms, not blocks, were drawn to the arms, so each room's blocks are averaged and room means are compared with farm as block.${perArm ? ` Rooms analysed: ${perArm}.` : ""}${icc}`;
}
