import { roomsPerArm, StatsInputError } from "@/lib/stats";
import { sizingInputProblems } from "./sample-size";

/**
 * A room-level trial: a climate regime applies to a whole fruiting room, so each farm's rooms, not
 * its blocks, are randomised to the arms, and every block of a room is in that room's arm. Each arm
 * names a climate regime (a treatment of kind "humidity"), a different one per arm.
 */
export function roomArmsProblems(
  arms: readonly { label: string; treatmentId: string | null }[],
  treatments: readonly { id: string; kind: string }[],
): string[] {
  const problems: string[] = [];
  const regimes = new Set<string>();
  for (const [index, arm] of arms.entries()) {
    const treatment = treatments.find((candidate) => candidate.id === arm.treatmentId);
    if (!treatment || treatment.kind !== "humidity") {
      problems.push(`Arm ${arm.label || index + 1}: pick the climate regime its rooms are run under.`);
    } else if (regimes.has(treatment.id)) {
      problems.push(`Arm ${arm.label || index + 1}: another arm already runs this climate regime; give each arm its own.`);
    } else {
      regimes.add(treatment.id);
    }
  }
  return problems;
}

export interface RoomSampleSizeInput {
  /** Smallest difference in BE worth finding, in BE points. */
  difference: number;
  /** SD of BE between blocks of one arm on one farm, in BE points. */
  sd: number;
  plannedFarms: number;
  /** Share of blocks expected to be lost, 0 ≤ loss < 1. */
  expectedLoss: number;
  arms: number;
  /** Blocks each room holds (m). */
  blocksPerRoom: number;
  /** How alike blocks in one room are (intraclass correlation), 0 ≤ ICC < 1. */
  icc: number;
}

export interface RoomSampleSizeRow {
  power: number;
  /** Rooms per arm the room-mean analysis needs (exact). */
  exactRoomsPerArm: number;
  /** Rooms per arm on each farm, a whole number, after the expected loss (lost blocks make a room's mean less sure). */
  roomsPerFarmPerArm: number;
  roomsPerArm: number;
  blocksPerArm: number;
  totalBlocks: number;
  /** Blocks per arm a trial randomising blocks would need for the same power. */
  blocksPerArmIfBlocksRandomised: number;
}

export type RoomSampleSizePanel =
  { ok: true; designEffect: number; rows: RoomSampleSizeRow[]; pairs: number } | { ok: false; problems: Record<string, string> };

/**
 * Rooms per arm for a room-level trial: lib/stats roomsPerArm (the design effect 1 + (m − 1)·ICC,
 * Kerry & Bland 1998, turned into the SD of a room's mean and sized with the Tukey/blocked size on
 * room means with farm as block). Rooms are made more for the expected loss and rounded up so
 * every farm randomises the same whole number of rooms to each arm.
 */
export function roomTrialSampleSize(input: RoomSampleSizeInput, powers: readonly number[] = [0.8, 0.9]): RoomSampleSizePanel {
  const problems = sizingInputProblems(input);
  if (!Number.isInteger(input.blocksPerRoom) || input.blocksPerRoom < 1)
    problems.blocksPerRoom = "Give the number of blocks each room holds, a whole number of 1 or more.";
  if (!(input.icc >= 0 && input.icc < 1))
    problems.roomIcc = "Give how alike blocks in one room are as a number from 0 up to (not including) 1, e.g. 0.1.";
  if (Object.keys(problems).length) return { ok: false, problems };
  const arms = Math.max(input.arms, 2);
  try {
    const rows = powers.map((power) => {
      const size = roomsPerArm({
        delta: input.difference,
        sd: input.sd,
        blocksPerRoom: input.blocksPerRoom,
        icc: input.icc,
        arms,
        farms: input.plannedFarms,
        power,
      });
      const roomsPerFarmPerArm = Math.ceil(size.roomsPerArm / (1 - input.expectedLoss) / input.plannedFarms - 1e-9);
      const rooms = roomsPerFarmPerArm * input.plannedFarms;
      return {
        power,
        exactRoomsPerArm: size.roomsPerArm,
        roomsPerFarmPerArm,
        roomsPerArm: rooms,
        blocksPerArm: rooms * input.blocksPerRoom,
        totalBlocks: rooms * input.blocksPerRoom * arms,
        blocksPerArmIfBlocksRandomised: size.blocksPerArmIfBlocksRandomised,
      };
    });
    return { ok: true, designEffect: 1 + (input.blocksPerRoom - 1) * input.icc, rows, pairs: (arms * (arms - 1)) / 2 };
  } catch (error) {
    if (error instanceof StatsInputError) return { ok: false, problems: { form: error.message } };
    throw error;
  }
}
