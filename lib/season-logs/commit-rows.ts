import { randomFillSync, randomInt } from "node:crypto";
import { Readable } from "node:stream";
import { pipeline } from "node:stream/promises";
import { createGzip, gunzipSync } from "node:zlib";
import { v7 as timeOrderedId } from "uuid";
import { z } from "zod";
import type { RegisterEntryText } from "../import/registers";
import { seasonLogSchemaVersion } from "../import/schema";
import { copyChunks } from "./copy-text";
import type { BlockWrite, CommitPlan, HarvestWrite, PlanCounts, StoredHarvest } from "./plan";
import type { ParseChoices } from "./report";

/** A table's rows in COPY text, as chunks: made as they are read, so the whole text is never one string. */
export type CopyText = Iterable<string | Uint8Array>;

/**
 * A plan as the rows the commit writes: each table's rows in COPY's text format, new rows with
 * their ids already given, so a harvest of a new block carries that block's id. Made at upload,
 * it is kept with the upload (gzip) and, when neither the farm's data nor the registers changed
 * since, written as it is: the commit then neither reads the file again nor plans again.
 * The texts of `commitRowsOf` are made as they are read, and can be read once.
 */
export interface CommitRows {
  /** is_new, id, code, strain … notes: the columns of the commit's staging table for blocks. */
  blocks: CopyText;
  harvests: CopyText;
  changes: CopyText;
  blockCount: number;
  changedBlocks: number;
  harvestCount: number;
  changedHarvests: number;
  changeCount: number;
  /** Blocks with a fruiting room (staged room_id not null): none, and the commit writes no room moves. */
  roomCount: number;
  /** Ids of the stored harvests the grower chose to remove (empty unless they did). */
  removedHarvestIds: string[];
  counts: PlanCounts;
  /** Stored harvests of the file's blocks that the file leaves out: a choice to remove them needs a plan of its own. */
  notInFileHarvests: number;
}

/**
 * Time-ordered ids (UUIDv7) for one commit's new rows: the millisecond they were made, then a
 * counter from a random start, so they sort in the order made and land at the end of the indexes
 * instead of on random pages. Random bits come from one buffer filled at a time: the package's
 * default asks the system for 16 random bytes per id, 20 times slower.
 */
export function idsInOrder(): () => string {
  const msecs = Date.now();
  const random = new Uint8Array(16 * 1024);
  let seq = randomInt(2 ** 30);
  let used = random.length;
  return () => {
    if (used === random.length) {
      randomFillSync(random);
      used = 0;
    }
    used += 16;
    return timeOrderedId({ msecs, seq: seq++, random: random.subarray(used - 16, used) });
  };
}

/**
 * The plan's rows. `storedBlockIds` maps the farm's stored block codes to their ids: a value
 * change or a removed harvest of a block the plan leaves untouched still needs its block's id.
 */
export function commitRowsOf(
  plan: CommitPlan & { removedHarvests?: readonly StoredHarvest[] },
  storedBlockIds: ReadonlyMap<string, string>,
  nextId: () => string = idsInOrder(),
): CommitRows {
  const blockIds = new Map(storedBlockIds);
  const newBlocks = new Map<BlockWrite, string>();
  for (const block of plan.blocks) {
    const id = block.id ?? nextId();
    if (block.id === null) newBlocks.set(block, id);
    blockIds.set(block.code, id);
  }
  const newHarvests = new Map<HarvestWrite, string>();
  for (const harvest of plan.harvests) if (harvest.id === null) newHarvests.set(harvest, nextId());
  const blockIdOf = (code: string, known: string | null = null) => {
    const id = known ?? blockIds.get(code);
    if (id === undefined) throw new Error(`the plan has a row of block ${code} but not the block`);
    return id;
  };
  const removedHarvests = plan.removedHarvests ?? [];
  return {
    blocks: copyChunks(plan.blocks, (b) => [
      newBlocks.has(b),
      b.id ?? newBlocks.get(b),
      b.code,
      b.strainId,
      b.substrateRecipeId,
      b.fruitingMethodId,
      b.trialArmId,
      b.inoculatedOn,
      b.wetMassG,
      b.wetMassAsWritten,
      b.wetMassUnit,
      b.moisture,
      b.contaminated,
      b.contaminatedOn,
      b.spentMassG,
      b.spentMassAsWritten,
      b.spentMassUnit,
      b.notes,
      b.seasonYear,
      b.roomId,
    ]),
    harvests: copyChunks(plan.harvests, (h) => [
      newHarvests.has(h),
      h.id ?? newHarvests.get(h),
      blockIdOf(h.blockCode, h.blockId),
      h.flush,
      h.harvestedOn,
      h.freshMassG,
      h.freshMassAsWritten,
      h.freshMassUnit,
      h.dryMassG,
      h.dryMassAsWritten,
      h.dryMassUnit,
    ]),
    changes: copyChunks(plan.changes, (change) => [
      blockIdOf(change.blockCode),
      change.flush,
      change.field,
      change.oldValue,
      change.newValue,
    ]),
    blockCount: plan.blocks.length,
    changedBlocks: plan.blocks.length - newBlocks.size,
    harvestCount: plan.harvests.length,
    changedHarvests: plan.harvests.length - newHarvests.size,
    changeCount: plan.changes.length,
    roomCount: plan.blocks.reduce((count, block) => (block.roomId === null ? count : count + 1), 0),
    removedHarvestIds: removedHarvests.map((harvest) => harvest.id),
    counts: plan.counts,
    notInFileHarvests: plan.notInFile.harvests.length,
  };
}

/** What a file's reading depended on besides its bytes: the grower's choices, the strain register and the day. */
export function stagingKey(choices: ParseChoices, knownStrains: readonly (string | RegisterEntryText)[], today: string): string {
  const sorted = (entries: [string, string][]) => entries.sort(([a], [b]) => (a < b ? -1 : a > b ? 1 : 0));
  return JSON.stringify([
    choices.mapping ? sorted(Object.entries(choices.mapping)) : null,
    choices.dateOrder ?? null,
    choices.defaultMassUnit ?? null,
    choices.decimal ?? null,
    choices.decimalByColumn ? sorted(Object.entries(choices.decimalByColumn)) : null,
    choices.sheet ?? null,
    knownStrains.map((strain) => (typeof strain === "string" ? strain : JSON.stringify([strain.code, strain.names ?? []]))).sort(),
    today,
    // Rows kept under an earlier version of the columns have fewer cells than the staged table.
    seasonLogSchemaVersion,
  ]);
}

type Counted = Omit<CommitRows, "blocks" | "harvests" | "changes">;

/**
 * What an upload keeps, gzip: a first line with what the rows were planned against (see
 * `keptCommitRows`), the three tables' COPY texts one after the other, and a last line with their
 * lengths in bytes and the counts. Compressed as the rows are made, so three large uploads at
 * once never hold their texts whole (tests/e2e/upload-memory.test.ts).
 */
export async function keepCommitRows(key: string, marker: string, rows: CommitRows): Promise<Buffer> {
  const { blocks, harvests, changes, ...counted } = rows;
  const lengths = [0, 0, 0];
  function* text() {
    yield `${JSON.stringify({ key, marker })}\n`;
    for (const [section, chunks] of [blocks, harvests, changes].entries())
      for (const chunk of chunks) {
        lengths[section] += typeof chunk === "string" ? Buffer.byteLength(chunk) : chunk.byteLength;
        yield chunk;
      }
    yield JSON.stringify({ lengths, ...counted } satisfies Counted & { lengths: number[] });
  }
  const compressed: Buffer[] = [];
  await pipeline(Readable.from(text()), createGzip({ level: 1 }), async (gzipped: AsyncIterable<Buffer>) => {
    for await (const chunk of gzipped) compressed.push(chunk);
  });
  return Buffer.concat(compressed);
}

const keptHeader = z.object({ key: z.string(), marker: z.string() });

function safeJson(text: string): unknown {
  try {
    return JSON.parse(text);
  } catch {
    return null;
  }
}

/**
 * The kept rows if they were planned under the same choices, registers and day (`key`, the
 * parse's staging key) against the same stored data (`marker`, lib/data's farm data marker);
 * otherwise null, and the commit reads the file and plans again.
 */
export function keptCommitRows(kept: Buffer | null, key: string, marker: string): CommitRows | null {
  if (!kept) return null;
  const text = gunzipSync(kept);
  const headerEnd = text.indexOf(10);
  // A copy in any other shape (one kept by an earlier version) is not read: the commit plans again.
  const header = keptHeader.safeParse(headerEnd > 0 ? safeJson(text.subarray(0, headerEnd).toString("utf8")) : null);
  if (!header.success || header.data.key !== key || header.data.marker !== marker) return null;
  const trailerStart = text.lastIndexOf(10) + 1;
  const { lengths, ...counted } = JSON.parse(text.subarray(trailerStart).toString("utf8")) as Counted & { lengths: number[] };
  let at = headerEnd + 1;
  const [blocks, harvests, changes] = lengths.map((length) => [text.subarray(at, (at += length))]);
  return { blocks, harvests, changes, ...counted };
}
