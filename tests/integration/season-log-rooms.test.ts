/**
 * The season log's fruiting_room column against the real database, as rhizo_app under row-level
 * security: a block's room becomes its move "from the start of fruiting" (moved_on null) with the
 * upload's id, in the commit's one transaction; the same rows again change nothing; a changed room
 * updates that move and is kept in the block's history (and an undo puts it back); a farm's file
 * matches that farm's rooms only; the composite key refuses a room of another farm even to the superuser.
 */
import type { Pool } from "pg";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { closeDatabase } from "@/db/client";
import { undoCommit } from "@/lib/data/corrections";
import type { Member } from "@/lib/data/members";
import { commitUpload, createUpload, getImportSetup, getSeasonLogExport, parseStored, type UploadView } from "@/lib/data/season-logs";
import { isAppError } from "@/lib/errors";
import { runQueuedJobs, stopJobWorkers } from "@/lib/jobs/worker";
import { databaseRefusal, memberOf, superuserPool, twoDemoFarms, type DemoFarm } from "./support/database";

let inspector: Pool;
let farmA: DemoFarm;
let farmB: DemoFarm;
let asFarmA: Member;
let asFarmB: Member;
const room: Record<string, string> = {};

beforeAll(async () => {
  inspector = superuserPool();
  [farmA, farmB] = await twoDemoFarms(inspector);
  asFarmA = await memberOf(farmA.managerId);
  asFarmB = await memberOf(farmB.managerId);
  // Rooms are made on the Rooms page; here the superuser makes them, with names no demo farm uses.
  for (const [farm, name, kind] of [
    [farmA, "Rm Tent 1", "tent"],
    [farmA, "Rm Tub by the door", "tub"],
    [farmB, "Rm Farm B shed", "room"],
  ] as const) {
    const { rows } = await inspector.query<{ id: string }>(
      "insert into fruiting_rooms (farm_id, name, kind, fresh_air) values ($1, $2, $3, 'fan_timer') returning id",
      [farm.id, name, kind],
    );
    room[name] = rows[0].id;
  }
});

afterAll(async () => {
  await runQueuedJobs(["pooled-refresh"]);
  await stopJobWorkers();
  await inspector.query("alter table harvests drop constraint if exists test_refuse_778");
  await inspector.end();
  await closeDatabase();
});

const header = "block_id,strain,inoculated_on,Fruiting room,flush,harvested_on,fresh_weight";

function sheet(rows: [block: string, room: string][]): string {
  const lines = [header];
  for (const [block, roomName] of rows) lines.push(`${block},PO-01,2026-03-01,${roomName},1,2026-04-10,400 g`);
  return `${lines.join("\r\n")}\r\n`;
}

async function upload(member: Member, text: string, fileName: string): Promise<UploadView> {
  const content = new TextEncoder().encode(text);
  const setup = await getImportSetup(member);
  return createUpload(member, { fileName, content, result: await parseStored(content, setup, {}), choices: {} });
}

async function refusal(work: Promise<unknown>): Promise<{ code: string; message: string }> {
  try {
    await work;
  } catch (error) {
    if (isAppError(error)) return { code: error.code, message: error.message };
    throw error;
  }
  throw new Error("went through where it should have been refused");
}

interface StoredMove {
  code: string;
  id: string;
  room_id: string;
  moved_on: string | null;
  upload_id: string | null;
  farm_id: string;
}

async function moves(prefix: string): Promise<StoredMove[]> {
  const { rows } = await inspector.query<StoredMove>(
    `select b.code, m.id, m.room_id, m.moved_on::text, m.upload_id, m.farm_id
     from block_room_moves m join blocks b on b.id = m.block_id where b.code like $1 || '%' order by b.code, m.moved_on nulls first`,
    [prefix],
  );
  return rows;
}

describe("the fruiting_room column", () => {
  it("commits each block's room as its move from the start of fruiting, with the upload that said so", async () => {
    const view = await upload(
      asFarmA,
      sheet([
        ["RM-1", "Rm Tent 1"],
        ["RM-2", "rm tub BY the door"],
        ["RM-3", ""],
      ]),
      "rooms-1.csv",
    );
    expect(view.report.errorCount).toBe(0);
    expect(view.report.preview.rooms).toEqual({
      count: 2,
      blocks: [
        { blockCode: "RM-1", room: "Rm Tent 1", change: "new" },
        { blockCode: "RM-2", room: "Rm Tub by the door", change: "new" },
      ],
    });
    await commitUpload(asFarmA, view.upload.id, {});
    expect(await moves("RM-")).toEqual([
      expect.objectContaining({ code: "RM-1", room_id: room["Rm Tent 1"], moved_on: null, upload_id: view.upload.id, farm_id: farmA.id }),
      expect.objectContaining({ code: "RM-2", room_id: room["Rm Tub by the door"], moved_on: null, upload_id: view.upload.id }),
    ]);
    // The download in the upload format writes the room back under its own name.
    const { csv } = await getSeasonLogExport(asFarmA);
    expect(csv.split("\r\n")[0]).toContain(",fruiting_room,");
    expect(csv).toMatch(/\r\nRM-1,PO-01,[^\r\n]*,Rm Tent 1,1,/);
  });

  it("changes nothing when the same rows come again, in the same file or another", async () => {
    const before = await moves("RM-");
    const text = sheet([
      ["RM-1", "Rm Tent 1"],
      ["RM-2", "rm tub BY the door"],
      ["RM-3", ""],
    ]);
    const same = await upload(asFarmA, text, "rooms-1-again.csv");
    expect(same.upload.outcome).toBe("already_imported");
    expect(same.canCommit).toBe(false);
    // Other capitals and another order: another file, the same rooms.
    const other = await upload(
      asFarmA,
      sheet([
        ["RM-2", "Rm Tub by the door"],
        ["RM-1", "RM TENT 1"],
        ["RM-3", ""],
      ]),
      "rooms-1-b.csv",
    );
    expect(other.report.preview.rooms?.blocks.map((entry) => entry.change)).toEqual(["same", "same"]);
    const receipt = await commitUpload(asFarmA, other.upload.id, {});
    expect(receipt.counts).toMatchObject({ newBlocks: 0, changedBlocks: 0, untouchedBlocks: 3 });
    expect(receipt.changedValues).toBe(0);
    expect(await moves("RM-")).toEqual(before);
  });

  it("updates the move from the start when the room changes, keeps the old room in history, and a blank cell keeps the room", async () => {
    const before = await moves("RM-");
    const view = await upload(
      asFarmA,
      sheet([
        ["RM-1", "Rm Tub by the door"],
        ["RM-2", ""],
        ["RM-3", "Rm Tent 1"],
      ]),
      "rooms-2.csv",
    );
    expect(view.report.preview.rooms?.blocks).toEqual([
      { blockCode: "RM-1", room: "Rm Tub by the door", change: "changed" },
      { blockCode: "RM-3", room: "Rm Tent 1", change: "added" },
    ]);
    await commitUpload(asFarmA, view.upload.id, {});
    const after = await moves("RM-");
    expect(after).toHaveLength(3);
    // The same row, its room replaced: one move "from the start" per block.
    expect(after[0]).toMatchObject({ code: "RM-1", id: before[0].id, room_id: room["Rm Tub by the door"], upload_id: view.upload.id });
    expect(after[1]).toEqual(before[1]);
    expect(after[2]).toMatchObject({ code: "RM-3", room_id: room["Rm Tent 1"], moved_on: null, upload_id: view.upload.id });
    const { rows: history } = await inspector.query(
      `select b.code, v.field, v.old_value, v.new_value, v.upload_id from value_changes v join blocks b on b.id = v.block_id
       where v.upload_id = $1 order by b.code`,
      [view.upload.id],
    );
    expect(history).toEqual([
      { code: "RM-1", field: "fruiting_room", old_value: "Rm Tent 1", new_value: "Rm Tub by the door", upload_id: view.upload.id },
      { code: "RM-3", field: "fruiting_room", old_value: null, new_value: "Rm Tent 1", upload_id: view.upload.id },
    ]);

    // Undoing the commit puts the replaced room back and removes the move it added.
    await undoCommit(asFarmA, { uploadId: view.upload.id, reason: "wrong rooms" });
    expect(await moves("RM-")).toEqual(before);
  });

  it("refuses to undo a commit whose room a move on the block's page has replaced since, and changes nothing", async () => {
    const view = await upload(
      asFarmA,
      sheet([
        ["RM-1", "Rm Tub by the door"],
        ["RM-2", ""],
        ["RM-3", ""],
      ]),
      "rooms-3.csv",
    );
    await commitUpload(asFarmA, view.upload.id, {});
    // As the block page records a move from the start: the room replaced, the upload's id cleared.
    await inspector.query(
      `update block_room_moves set room_id = $1, upload_id = null
       where moved_on is null and block_id = (select id from blocks where farm_id = $2 and code = 'RM-1')`,
      [room["Rm Tent 1"], farmA.id],
    );
    const before = await moves("RM-");
    const error = await refusal(undoCommit(asFarmA, { uploadId: view.upload.id, reason: "wrong rooms" }));
    expect(error.code).toBe("conflict");
    expect(error.message).toContain("the fruiting room of block RM-1");
    expect(await moves("RM-")).toEqual(before);
  });

  it("matches a farm's own rooms only: another farm's room name is unknown, and its message names only the farm's own", async () => {
    const fromA = await upload(asFarmA, sheet([["RM-4", "Rm Farm B shed"]]), "rooms-b-name.csv");
    const issue = fromA.report.issues.find((entry) => entry.code === "unknown_fruiting_room");
    expect(issue).toMatchObject({ line: 2, column: "fruiting_room", value: "Rm Farm B shed", severity: "error" });
    expect(issue?.message).toContain('"Rm Tent 1", "Rm Tub by the door"');
    expect(issue?.message).toContain("Rooms page");
    expect(fromA.canCommit).toBe(false);
    const fromB = await upload(asFarmB, sheet([["RM-B-1", "Rm Tent 1"]]), "rooms-a-name.csv");
    const theirs = fromB.report.issues.find((entry) => entry.code === "unknown_fruiting_room");
    expect(theirs?.message).toContain('"Rm Farm B shed"');
    expect(theirs?.message).not.toContain("Rm Tub");
    const { rows } = await inspector.query("select count(*)::int as count from fruiting_rooms where name = 'Rm Tent 1'");
    // Nothing was made from the cell.
    expect(rows[0]).toEqual({ count: 1 });
  });

  it("refuses, by its composite key, a move of farm A's block into farm B's room, even to the superuser", async () => {
    const { rows } = await inspector.query<{ id: string }>("select id from blocks where farm_id = $1 and code = 'RM-1'", [farmA.id]);
    expect(
      await databaseRefusal(
        inspector.query("insert into block_room_moves (farm_id, block_id, room_id, moved_on) values ($1, $2, $3, '2026-05-01')", [
          farmA.id,
          rows[0].id,
          room["Rm Farm B shed"],
        ]),
      ),
    ).toContain("block_room_moves_room_farm_fk");
  });

  it("plans again at commit when the farm's rooms changed since the upload: a room renamed is then unknown, and nothing is saved", async () => {
    const view = await upload(asFarmA, sheet([["RM-5", "Rm Tent 1"]]), "rooms-renamed.csv");
    expect(view.canCommit).toBe(true);
    await inspector.query("update fruiting_rooms set name = 'Rm Tent One' where id = $1", [room["Rm Tent 1"]]);
    try {
      const error = await refusal(commitUpload(asFarmA, view.upload.id, {}));
      expect(error.code).toBe("invalid_input");
      expect(error.message).toContain('"Rm Tent 1" is not one of your farm\'s rooms');
      expect(await moves("RM-5")).toEqual([]);
    } finally {
      await inspector.query("update fruiting_rooms set name = 'Rm Tent 1' where id = $1", [room["Rm Tent 1"]]);
    }
  });

  it("leaves no move, block or harvest when the database refuses a row after the moves were written", async () => {
    // A test-only check refuses one harvest; the harvests are written after the blocks and their moves.
    await inspector.query("alter table harvests add constraint test_refuse_778 check (fresh_mass_g <> 778) not valid");
    const lines = [header];
    for (let block = 1; block <= 200; block++)
      lines.push(
        `RM-K-${block},PO-01,2026-03-01,${block % 2 ? "Rm Tent 1" : "Rm Tub by the door"},1,2026-04-10,${block === 100 ? 778 : 400} g`,
      );
    const view = await upload(asFarmA, `${lines.join("\r\n")}\r\n`, "rooms-large.csv");
    expect(view.canCommit).toBe(true);
    try {
      expect(await databaseRefusal(commitUpload(asFarmA, view.upload.id, {}))).toContain("test_refuse_778");
      const { rows } = await inspector.query(
        `select (select count(*)::int from blocks where code like 'RM-K-%') as blocks,
           (select count(*)::int from block_room_moves where upload_id = $1) as moves`,
        [view.upload.id],
      );
      expect(rows[0]).toEqual({ blocks: 0, moves: 0 });
    } finally {
      await inspector.query("alter table harvests drop constraint if exists test_refuse_778");
    }
    await commitUpload(asFarmA, view.upload.id, {});
    const stored = await moves("RM-K-");
    expect(stored).toHaveLength(200);
    expect(stored.every((move) => move.moved_on === null && move.upload_id === view.upload.id && move.farm_id === farmA.id)).toBe(true);
  });
});
