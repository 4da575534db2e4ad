/**
 * Fruiting rooms, their regimes and the moves of blocks between them are a farm's own rows: never
 * read or written by another farm, the coordinator or an observer, whatever they try, and a move
 * or regime cannot tie one farm's block to another farm's room even when row-level security is
 * not in the way (the superuser, psql): the composite tenant keys refuse it.
 */
import { Client, type Pool } from "pg";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { closeDatabase, withFarmContext, type FarmContext } from "@/db/client";
import { blockRoomMoves, fruitingRooms, roomRegimes } from "@/db/schema";
import { listHarvestTargets, recordHarvest } from "@/lib/data/blocks";
import type { Member } from "@/lib/data/members";
import { getRoom, listRooms, moveBlock, recordRegimeChange } from "@/lib/data/rooms";
import { isAppError } from "@/lib/errors";
import { roomOn } from "@/lib/rooms/regimes";
import { regimeChangeSchema } from "@/lib/rooms/schemas";
import { databaseRefusal, memberOf, superuserPool, twoDemoFarms, type DemoFarm } from "../support/database";

let inspector: Pool;
let farmA: DemoFarm;
let farmB: DemoFarm;
let managerA: Member;
let roomA: string;
let roomB: string;
let blockA: string;
let blockB: string;
let coordinatorId: string;
let observerId: string;

const tables = [fruitingRooms, roomRegimes, blockRoomMoves] as const;

beforeAll(async () => {
  inspector = superuserPool();
  [farmA, farmB] = await twoDemoFarms(inspector);
  managerA = await memberOf(farmA.managerId);
  const first = async (query: string, values: unknown[]) => (await inspector.query<{ id: string }>(query, values)).rows[0].id;
  // The demo seed gives both farms rooms (db/seed-rooms.ts).
  roomA = await first("select id from fruiting_rooms where farm_id = $1 order by name limit 1", [farmA.id]);
  roomB = await first("select id from fruiting_rooms where farm_id = $1 order by name limit 1", [farmB.id]);
  blockA = await first("select id from blocks where farm_id = $1 order by code limit 1", [farmA.id]);
  blockB = await first("select id from blocks where farm_id = $1 order by code limit 1", [farmB.id]);
  coordinatorId = await first("select id from users where role = 'coordinator' limit 1", []);
  observerId = await first("select id from users where role = 'observer' limit 1", []);
});

afterAll(async () => {
  await inspector.end();
  await closeDatabase();
});

async function refusedWith(work: Promise<unknown>): Promise<string> {
  try {
    await work;
  } catch (error) {
    if (isAppError(error)) return `${error.code}: ${[error.message, ...error.fieldProblems.map((problem) => problem.message)].join(" ")}`;
    throw error;
  }
  throw new Error("the data layer accepted what it should have refused");
}

describe("rooms between farms", () => {
  it("shows farm B none of farm A's rooms, regimes or moves, and farm A only its own", async () => {
    const asB: FarmContext = { userId: farmB.managerId, farmId: farmB.id, role: "farm_manager" };
    for (const table of tables) {
      const seen = await withFarmContext(asB, (tx) => tx.select({ farmId: table.farmId }).from(table));
      expect(seen.length, "farm B has demo rows of its own").toBeGreaterThan(0);
      expect(new Set(seen.map((row) => row.farmId))).toEqual(new Set([farmB.id]));
    }
    expect((await listRooms(managerA, "2026-06-01")).map((room) => room.id)).not.toContain(roomB);
  });

  it("refuses farm A writing a room, regime or move under farm B's name, and changes none of farm B's", async () => {
    const asA: FarmContext = { userId: farmA.managerId, farmId: farmA.id, role: "farm_manager" };
    expect(
      await databaseRefusal(
        withFarmContext(asA, (tx) =>
          tx.insert(fruitingRooms).values({ farmId: farmB.id, name: "Planted", kind: "tub", freshAir: "filter_holes" }),
        ),
      ),
    ).toMatch(/row-level security/);
    expect(
      await databaseRefusal(
        withFarmContext(asA, (tx) =>
          tx.insert(roomRegimes).values({
            farmId: farmB.id,
            roomId: roomB,
            startsOn: "2026-01-01",
            humidityMode: "cycling",
            cycleOnMinutes: 1,
            cycleOffMinutes: 1,
          }),
        ),
      ),
    ).toMatch(/row-level security/);
    expect(
      await databaseRefusal(
        withFarmContext(asA, (tx) =>
          tx.insert(blockRoomMoves).values({ farmId: farmB.id, blockId: blockB, roomId: roomB, movedOn: "2026-01-02" }),
        ),
      ),
    ).toMatch(/row-level security/);
    // Without a where clause on purpose: everything farm A could reach.
    /* eslint-disable drizzle/enforce-update-with-where */
    const touched = await withFarmContext(asA, async (tx) => ({
      renamed: await tx.update(fruitingRooms).set({ notes: "seen by farm A" }).returning({ farmId: fruitingRooms.farmId }),
      movesTouched: await tx.update(blockRoomMoves).set({ createdBy: farmA.managerId }).returning({ farmId: blockRoomMoves.farmId }),
    }));
    /* eslint-enable drizzle/enforce-update-with-where */
    expect(new Set([...touched.renamed, ...touched.movesTouched].map((row) => row.farmId))).toEqual(new Set([farmA.id]));
    const { rows } = await inspector.query<{ notes: string }>("select notes from fruiting_rooms where farm_id = $1", [farmB.id]);
    expect(rows.every((row) => row.notes !== "seen by farm A")).toBe(true);
    const { rows: moves } = await inspector.query<{ n: number }>("select count(*)::int as n from block_room_moves where farm_id = $1", [
      farmB.id,
    ]);
    expect(moves[0].n).toBeGreaterThan(0);
  });

  it("answers another farm's room as one that does not exist, in every data-layer way in", async () => {
    expect(await refusedWith(getRoom(managerA, roomB, "2026-06-01"))).toMatch(/^not_found: There is no such room on your farm/);
    const regime = regimeChangeSchema.parse({
      roomId: roomB,
      startsOn: "2026-06-01",
      humidityMode: "cycling",
      cycleOnMinutes: "2",
      cycleOffMinutes: "13",
    });
    expect(await refusedWith(recordRegimeChange(managerA, regime))).toMatch(/^not_found/);
    expect(await refusedWith(moveBlock(managerA, { blockId: blockA, roomId: roomB, movedOn: "2026-06-01" }))).toMatch(
      /^invalid_input: .*Pick the room from your rooms/,
    );
    expect(await refusedWith(moveBlock(managerA, { blockId: blockB, roomId: roomA, movedOn: "2026-06-01" }))).toMatch(/^not_found/);
  });
});

describe("the coordinator and an observer", () => {
  for (const [role, who] of [
    ["coordinator", () => coordinatorId],
    ["observer", () => observerId],
  ] as const) {
    it(`gives the ${role} no room, regime or move of any farm, and no way to write one`, async () => {
      const context: FarmContext = { userId: who(), farmId: null, role };
      for (const table of tables) expect(await withFarmContext(context, (tx) => tx.select().from(table))).toEqual([]);
      expect(
        await databaseRefusal(
          withFarmContext(context, (tx) =>
            tx.insert(fruitingRooms).values({ farmId: farmA.id, name: `By the ${role}`, kind: "room", freshAir: "fan_always" }),
          ),
        ),
      ).toMatch(/row-level security/);
      /* eslint-disable-next-line drizzle/enforce-update-with-where -- every row is the attempt */
      expect(await withFarmContext(context, (tx) => tx.update(roomRegimes).set({ notes: role }).returning())).toEqual([]);
      const member = await memberOf(who());
      expect(await refusedWith(listRooms(member, "2026-06-01"))).toMatch(/^forbidden: Only a farm's own people/);
    });
  }
});

describe("the composite tenant keys, with row-level security out of the way", () => {
  it("refuse a move of farm A's block into farm B's room, and farm B's block into farm A's room", async () => {
    const refusal = async (statement: string, values: unknown[]) => {
      try {
        await inspector.query(statement, values);
      } catch (error) {
        return (error as Error).message;
      }
      throw new Error(`accepted: ${statement}`);
    };
    const move = "insert into block_room_moves (farm_id, block_id, room_id, moved_on) values ($1, $2, $3, '2026-01-03')";
    expect(await refusal(move, [farmA.id, blockA, roomB])).toMatch(/block_room_moves_room_farm_fk/);
    expect(await refusal(move, [farmA.id, blockB, roomA])).toMatch(/block_room_moves_block_farm_fk/);
    expect(await refusal(move, [farmB.id, blockA, roomA])).toMatch(/block_room_moves_(block|room)_farm_fk/);
    expect(
      await refusal(
        "insert into room_regimes (farm_id, room_id, starts_on, humidity_mode, cycle_on_minutes, cycle_off_minutes) values ($1, $2, '2026-01-04', 'cycling', 2, 13)",
        [farmA.id, roomB],
      ),
    ).toMatch(/room_regimes_room_farm_fk/);
  });

  it("refuse a regime without its mode's own fields, or with the other mode's", async () => {
    const regime =
      "insert into room_regimes (farm_id, room_id, starts_on, humidity_mode, cycle_on_minutes, cycle_off_minutes, flood_starts_at, flood_hours) values ($1, $2, $3, $4, $5, $6, $7, $8)";
    const refused = async (values: unknown[]) =>
      await inspector.query(regime, values).then(
        () => "accepted",
        (error: Error) => error.message,
      );
    expect(await refused([farmA.id, roomA, "2030-01-01", "cycling", null, 13, null, null])).toMatch(/room_regimes_mode_columns/);
    expect(await refused([farmA.id, roomA, "2030-01-02", "flooding", 2, null, "07:00", 3])).toMatch(/room_regimes_mode_columns/);
  });
});

describe("the pooled-analysis role", () => {
  it("reads rooms, regimes and moves only in the columns pooled figures need", async () => {
    const client = new Client({ connectionString: process.env.ANALYST_DATABASE_URL });
    await client.connect();
    try {
      const { rows } = await client.query<{ moves: number }>(
        `select count(*)::int as moves from block_room_moves m join room_regimes r on r.room_id = m.room_id join fruiting_rooms f on f.id = m.room_id
         where r.humidity_mode is not null and f.kind is not null`,
      );
      expect(rows[0].moves).toBeGreaterThan(0);
      for (const statement of [
        "select name from fruiting_rooms",
        "select notes from room_regimes",
        "select created_by from block_room_moves",
      ])
        await expect(client.query(statement), statement).rejects.toThrow(/permission denied/);
    } finally {
      await client.end();
    }
  });
});

describe("the phone form's room picker", () => {
  it("records a move dated the harvest day when the room differs from the block's that day, and none when it is the same", async () => {
    const target = (await listHarvestTargets(managerA)).find((candidate) => candidate.moves.length > 0)!;
    const day = new Date().toISOString().slice(0, 10);
    const { rows: blockRows } = await inspector.query<{ id: string }>("select id from blocks where farm_id = $1 and code = $2", [
      farmA.id,
      target.code,
    ]);
    const { rows: roomRows } = await inspector.query<{ id: string }>(
      "select id from fruiting_rooms where farm_id = $1 and retired_on is null and id <> $2 order by name limit 1",
      [farmA.id, roomOn(target.moves, day)!.roomId],
    );
    const otherRoom = roomRows[0].id;
    const save = async (flush: number, roomId: string) => {
      const entry = { blockCode: target.code, flush, weight: "120", unit: "g" as const, harvestedOn: day, roomId };
      const first = await recordHarvest(managerA, { ...entry, acceptWarnings: [] });
      if (first.status === "warnings")
        await recordHarvest(managerA, { ...entry, acceptWarnings: first.warnings.map((warning) => warning.code) });
    };
    const movesOn = async () =>
      (
        await inspector.query<{ room_id: string }>("select room_id from block_room_moves where block_id = $1 and moved_on = $2", [
          blockRows[0].id,
          day,
        ])
      ).rows;
    await save(target.nextFlush, otherRoom);
    expect((await movesOn()).map((row) => row.room_id)).toEqual([otherRoom]);
    const { rows: before } = await inspector.query<{ n: number }>(
      "select count(*)::int as n from audit_events where action = 'block.moved' and details->>'blockId' = $1",
      [blockRows[0].id],
    );
    await save(target.nextFlush + 1, otherRoom);
    const { rows: after } = await inspector.query<{ n: number }>(
      "select count(*)::int as n from audit_events where action = 'block.moved' and details->>'blockId' = $1",
      [blockRows[0].id],
    );
    expect(after[0].n).toBe(before[0].n);
    expect(await movesOn()).toHaveLength(1);
  });
});
