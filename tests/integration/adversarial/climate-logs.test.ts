import { readFileSync } from "node:fs";
import { Client, type Pool } from "pg";
import { sql } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { closeDatabase, withFarmContext } from "@/db/client";
import { farmContextOf } from "@/lib/data/context";
import { getRoomClimate, uploadClimateLog } from "@/lib/data/climate";
import type { Member } from "@/lib/data/members";
import { databaseRefusal, memberOf, superuserPool, twoDemoFarms, type DemoFarm } from "../support/database";

/**
 * A room's climate log is a farm's own record, like its blocks: when it arrived there was no rule
 * for it yet. Another farm, the coordinator, an observer and the pooled-analysis role must read
 * none of it (no grant, no policy for them), and no farm may write a reading into another's log.
 */

let inspector: Pool;
let farmA: DemoFarm;
let farmB: DemoFarm;
let asFarmA: Member;
let asFarmB: Member;
let coordinator: Member;
let observer: Member;
let roomId: string;
const roomName = "climate-probe tub";
const file = new Uint8Array(readFileSync(new URL("../../fixtures/climate/preamble-and-co2.csv", import.meta.url)));
const options = { timeZone: "Europe/London" };

async function refusalOf(work: Promise<unknown>): Promise<{ code?: string; message: string }> {
  try {
    await work;
  } catch (error) {
    return error as { code?: string; message: string };
  }
  throw new Error("it was allowed");
}

beforeAll(async () => {
  inspector = superuserPool();
  [farmA, farmB] = await twoDemoFarms(inspector);
  asFarmA = await memberOf(farmA.managerId);
  asFarmB = await memberOf(farmB.managerId);
  const one = async (role: string) =>
    (await inspector.query<{ id: string }>("select id from users where role = $1 order by email limit 1", [role])).rows[0].id;
  coordinator = await memberOf(await one("coordinator"));
  observer = await memberOf(await one("observer"));
  const { rows } = await inspector.query<{ id: string }>(
    "insert into fruiting_rooms (farm_id, name, kind, fresh_air) values ($1, $2, 'tub', 'filter_holes') returning id",
    [farmA.id, roomName],
  );
  roomId = rows[0].id;
  await uploadClimateLog(asFarmA, { roomId, fileName: "tub.csv", bytes: file, options });
});

afterAll(async () => {
  await inspector.query("delete from fruiting_rooms where name = $1", [roomName]);
  await inspector.query("delete from audit_events where action = 'climate-log.uploaded' and subject like 'tub%.csv'");
  await inspector.end();
  await closeDatabase();
});

describe("a room's climate log", () => {
  it("is stored once, with its readings, and read back by its own farm", async () => {
    const climate = await getRoomClimate(asFarmA, roomId, "Europe/London");
    expect(climate.logs).toHaveLength(1);
    expect(climate.readings).toHaveLength(12);
    expect(climate.readings[0]).toMatchObject({
      takenAt: Date.UTC(2026, 3, 2, 7),
      temperatureC: 19.6,
      relativeHumidity: 93.1,
      co2Ppm: 1210,
    });
    const { rows } = await inspector.query<{ n: number }>(
      "select count(*)::int as n from audit_events where action = 'climate-log.uploaded' and farm_id = $1",
      [farmA.id],
    );
    expect(rows[0].n).toBeGreaterThanOrEqual(1);
  });

  it("says so when the same file comes again, and leaves out readings an earlier log covers", async () => {
    expect((await refusalOf(uploadClimateLog(asFarmA, { roomId, fileName: "tub-again.csv", bytes: file, options }))).message).toMatch(
      /uploaded before \(as 'tub.csv'/,
    );
    // The same logger's next export: its first six readings repeat the last file's times, two are new.
    const times = ["09:00", "09:10", "09:20", "09:30", "09:40", "09:50", "10:00", "10:10"];
    const next = ["Date,Time,Temp (C),RH (%)", ...times.map((time) => `2026-04-02,${time}:00,20,90`)].join("\n");
    const result = await uploadClimateLog(asFarmA, { roomId, fileName: "tub-next.csv", bytes: new TextEncoder().encode(next), options });
    expect(result).toMatchObject({ stored: 2, skipped: 6 });
  });

  it("is not found by another farm, which cannot read, add to or write into it", async () => {
    expect((await refusalOf(getRoomClimate(asFarmB, roomId, "UTC"))).code).toBe("not_found");
    expect((await refusalOf(uploadClimateLog(asFarmB, { roomId, fileName: "tub-b.csv", bytes: file, options }))).code).toBe("not_found");
    const seen = await withFarmContext(farmContextOf(asFarmB), async (tx) => ({
      logs: (await tx.execute<{ n: number }>(sql`select count(*)::int as n from climate_logs where room_id = ${roomId}`)).rows[0].n,
      readings: (await tx.execute<{ n: number }>(sql`select count(*)::int as n from climate_readings where room_id = ${roomId}`)).rows[0].n,
    }));
    expect(seen).toEqual({ logs: 0, readings: 0 });
    const { rows } = await inspector.query<{ id: string }>("select id from climate_logs where room_id = $1 limit 1", [roomId]);
    // A reading planted in farm A's log, under farm B's name or farm A's: refused by the policy or the tenant key.
    for (const farmId of [farmA.id, farmB.id]) {
      expect(
        await databaseRefusal(
          withFarmContext(farmContextOf(asFarmB), (tx) =>
            tx.execute(sql`insert into climate_readings (log_id, farm_id, room_id, taken_at, relative_humidity)
              values (${rows[0].id}, ${farmId}, ${roomId}, now(), 50)`),
          ),
        ),
      ).toMatch(/row-level security|foreign key/);
    }
    const deleted = await withFarmContext(farmContextOf(asFarmB), (tx) =>
      tx.execute(sql`delete from climate_logs where room_id = ${roomId}`),
    );
    expect(deleted.rowCount).toBe(0);
  });

  it("is read by neither the coordinator nor an observer", async () => {
    for (const member of [coordinator, observer]) {
      expect((await refusalOf(getRoomClimate(member, roomId, "UTC"))).code, member.role).toBe("forbidden");
      const seen = await withFarmContext(farmContextOf(member), async (tx) => ({
        logs: (await tx.execute<{ n: number }>(sql`select count(*)::int as n from climate_logs`)).rows[0].n,
        readings: (await tx.execute<{ n: number }>(sql`select count(*)::int as n from climate_readings`)).rows[0].n,
      }));
      expect(seen, member.role).toEqual({ logs: 0, readings: 0 });
    }
  });

  it("is read by no column of the pooled-analysis role", async () => {
    const client = new Client({ connectionString: process.env.ANALYST_DATABASE_URL });
    await client.connect();
    try {
      for (const table of ["climate_logs", "climate_readings"]) {
        await expect(client.query(`select count(*) from ${table}`), table).rejects.toThrow(/permission denied/);
        await expect(client.query(`select farm_id from ${table} limit 1`), table).rejects.toThrow(/permission denied/);
      }
    } finally {
      await client.end();
    }
  });
});
