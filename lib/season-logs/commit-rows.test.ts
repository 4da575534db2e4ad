import { gzipSync } from "node:zlib";
import { describe, expect, it } from "vitest";
import { demoStrains } from "../import/generate";
import { commitRowsOf, keepCommitRows, keptCommitRows, stagingKey } from "./commit-rows";
import type { BlockWrite, CommitPlan, HarvestWrite } from "./plan";

const block = (code: string, id: string | null, seasonYear: number | null = null, roomId: string | null = null): BlockWrite => ({
  id,
  code,
  strainId: "strain-1",
  substrateRecipeId: null,
  fruitingMethodId: null,
  trialArmId: null,
  inoculatedOn: "2026-03-01",
  wetMassG: 2500,
  wetMassAsWritten: "2.5",
  wetMassUnit: "kg",
  moisture: 0.62,
  contaminated: false,
  contaminatedOn: null,
  spentMassG: null,
  spentMassAsWritten: null,
  spentMassUnit: null,
  // A tab to escape, and characters of more than one byte: the kept texts are cut by byte lengths.
  notes: "tab\there – grüne",
  seasonYear,
  roomId,
});

const harvest = (blockCode: string, flush: number, id: string | null, blockId: string | null): HarvestWrite => ({
  id,
  blockId,
  blockCode,
  flush,
  harvestedOn: "2026-04-10",
  freshMassG: 500,
  freshMassAsWritten: "500",
  freshMassUnit: "g",
  dryMassG: null,
  dryMassAsWritten: null,
  dryMassUnit: null,
});

const counts = { newBlocks: 1, changedBlocks: 1, untouchedBlocks: 1, newHarvests: 2, changedHarvests: 1, untouchedHarvests: 0 };

const plan: CommitPlan = {
  blocks: [block("NEW-1", null, null, "room-tent-1"), block("OLD-1", "stored-old-1", 2025)],
  harvests: [harvest("NEW-1", 1, null, null), harvest("OLD-1", 2, null, "stored-old-1"), harvest("OLD-1", 1, "stored-h-1", "stored-old-1")],
  changes: [{ blockCode: "UNTOUCHED-1", flush: 1, field: "fresh_weight", oldValue: "1", newValue: null }],
  newBlockCodes: ["NEW-1"],
  counts,
  notInFile: { harvests: [], blocks: 0 },
  issues: [],
  rooms: [{ blockCode: "NEW-1", room: "Tent 1", change: "new" }],
};

const textOf = (chunks: Iterable<string | Uint8Array>) =>
  Array.from(chunks, (chunk) => (typeof chunk === "string" ? chunk : Buffer.from(chunk).toString("utf8"))).join("");

const lines = (chunks: Iterable<string | Uint8Array>) =>
  textOf(chunks)
    .trimEnd()
    .split("\n")
    .map((line) => line.split("\t"));

describe("a plan's rows as the commit writes them", () => {
  let next = 0;
  const ids = () => `new-${++next}`;
  // Each test reads the texts of a plan of its own: they are made as they are read, once.
  const rowsOf = () => {
    next = 0;
    return commitRowsOf(plan, new Map([["UNTOUCHED-1", "stored-untouched-1"]]), ids);
  };

  it("gives new rows their ids and keeps stored ones, in COPY text with its escapes", () => {
    const rows = rowsOf();
    const blocks = lines(rows.blocks);
    expect(blocks.map((row) => row.slice(0, 3))).toEqual([
      ["t", "new-1", "NEW-1"],
      ["f", "stored-old-1", "OLD-1"],
    ]);
    // PostgreSQL documentation, COPY, "Text Format": a tab in a value is written as \t, null as \N.
    expect(blocks[0].at(-3)).toBe("tab\\there – grüne");
    // The season and the room are the staged table's last columns (lib/data/season-logs.ts stagedBlocks).
    expect(blocks.map((row) => row.at(-2))).toEqual(["\\N", "2025"]);
    expect(blocks.map((row) => row.at(-1))).toEqual(["room-tent-1", "\\N"]);
    expect(blocks[0][4]).toBe("\\N");
    expect(rows).toMatchObject({ blockCount: 2, changedBlocks: 1, harvestCount: 3, changedHarvests: 1, changeCount: 1, roomCount: 1 });
  });

  it("gives a harvest of a new block that block's new id, and a change of an untouched block the stored block's", () => {
    const rows = rowsOf();
    expect(lines(rows.harvests).map((row) => row.slice(0, 4))).toEqual([
      ["t", "new-2", "new-1", "1"],
      ["t", "new-3", "stored-old-1", "2"],
      ["f", "stored-h-1", "stored-old-1", "1"],
    ]);
    expect(lines(rows.changes)).toEqual([["stored-untouched-1", "1", "fresh_weight", "1", "\\N"]]);
  });

  it("refuses a plan with a row of a block it does not know, rather than write it without one", () => {
    const orphan = { ...plan, changes: [{ ...plan.changes[0], blockCode: "NOWHERE" }] };
    expect(() => textOf(commitRowsOf(orphan, new Map(), ids).changes)).toThrow(/NOWHERE/);
  });

  it("lists the harvests chosen for removal and how many the file leaves out", () => {
    const stored = { id: "stored-h-9", blockCode: "OLD-1", flush: 3, harvestedOn: null, freshMassG: 10, dryMassG: null };
    const removing = commitRowsOf(
      { ...plan, notInFile: { harvests: [stored], blocks: 0 }, removedHarvests: [stored] },
      new Map([["UNTOUCHED-1", "stored-untouched-1"]]),
      ids,
    );
    expect(removing).toMatchObject({ removedHarvestIds: ["stored-h-9"], notInFileHarvests: 1 });
  });

  it("is kept and given back only under the same key and marker", async () => {
    const rows = rowsOf();
    const [blocks, harvests, changes] = [textOf(rowsOf().blocks), textOf(rowsOf().harvests), textOf(rowsOf().changes)];
    const kept = await keepCommitRows("key", "7:abc", rows);
    const back = keptCommitRows(kept, "key", "7:abc");
    expect(back && [textOf(back.blocks), textOf(back.harvests), textOf(back.changes)]).toEqual([blocks, harvests, changes]);
    expect(back).toMatchObject({ blockCount: 2, changedBlocks: 1, harvestCount: 3, changeCount: 1, counts, removedHarvestIds: [] });
    expect(keptCommitRows(kept, "key", "8:abc")).toBeNull();
    expect(keptCommitRows(kept, "other key", "7:abc")).toBeNull();
    expect(keptCommitRows(null, "key", "7:abc")).toBeNull();
    // A copy kept in another shape (one JSON document, as an earlier version kept it) is planned again, not misread.
    expect(keptCommitRows(gzipSync(JSON.stringify({ key: "key", marker: "7:abc", rows: {} })), "key", "7:abc")).toBeNull();
  });
});

describe("the staging key: what reading a file depended on besides its bytes", () => {
  const key = stagingKey({ decimal: "," }, [...demoStrains], "2026-12-01");

  it("differs when the choices, the strain register or the day differ, not when the register's order does", () => {
    expect(stagingKey({ decimal: "." }, [...demoStrains], "2026-12-01")).not.toBe(key);
    expect(stagingKey({ decimal: "," }, [...demoStrains, "PO-99"], "2026-12-01")).not.toBe(key);
    expect(stagingKey({ decimal: "," }, [...demoStrains], "2026-12-02")).not.toBe(key);
    expect(stagingKey({ decimal: "," }, [...demoStrains].reverse(), "2026-12-01")).toBe(key);
    // A workbook's sheet and a column's decimal mark change what the file says.
    expect(stagingKey({ decimal: ",", sheet: "Rooms" }, [...demoStrains], "2026-12-01")).not.toBe(key);
    expect(stagingKey({ decimal: ",", decimalByColumn: { "Fresh (g)": "." } }, [...demoStrains], "2026-12-01")).not.toBe(key);
  });
});
