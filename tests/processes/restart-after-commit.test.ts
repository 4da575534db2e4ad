import type { PoolClient } from "pg";
import { afterAll, beforeAll, describe, expect, it, vi } from "vitest";
import { as, commitSeasonLog, copyOfTestDatabase, seasonLog, signIn, startApp, type App, type Database } from "./support/apps";

/**
 * Attack (or bad luck): the server is killed the moment a season-log commit has answered. Before
 * this round the pooled refresh ran in the dying process, fire-and-forget: the statistics stayed
 * stale for good, with no "results updating" flag and no repair after a restart. Now the refresh
 * is a job queued inside the commit's transaction, and a restarted server finishes it by itself.
 */

let database: Database;
let first: App | undefined;
let second: App | undefined;
let lock: PoolClient | undefined;
let farmId: string;
const blocks = 25;

beforeAll(async () => {
  database = await copyOfTestDatabase("restart");
  farmId = (await database.superuser.query<{ id: string }>("select id from farms where name = 'Fernbrook Farm'")).rows[0].id;
});

afterAll(async () => {
  lock?.release();
  await first?.kill();
  await second?.kill();
  await database?.drop();
});

async function pooledBlocks(): Promise<number> {
  const { rows } = await database.superuser.query<{ n: number }>(
    "select coalesce(sum(blocks), 0)::int as n from farm_strain_statistics where farm_id = $1 and flush_window = 'all'",
    [farmId],
  );
  return rows[0].n;
}

async function storedBlocks(): Promise<number> {
  const { rows } = await database.superuser.query<{ n: number }>("select count(*)::int as n from blocks where farm_id = $1", [farmId]);
  return rows[0].n;
}

/** What the coordinator's release panel says: pooled figures change only with a release, and the panel tells whether a farm's upload is still being added. */
async function updating(coordinator: string, app: App): Promise<boolean> {
  const response = await as(coordinator, app, "/settings/cooperative");
  expect(response.status).toBe(200);
  return (await response.text()).includes("still being added to the statistics");
}

describe("a server killed right after a season-log commit answered", () => {
  it("leaves the commit's refresh queued; the restarted server shows results updating, then catches up by itself", async () => {
    first = await startApp(database);
    const manager = await signIn(first, "manager@fernbrook.example");
    const coordinator = await signIn(first, "coordinator@aldervalley.example");
    expect(await updating(coordinator, first)).toBe(false);
    const before = await pooledBlocks();
    expect(before).toBe(await storedBlocks());

    // Hold the farm's refresh lock, so no refresh can finish before the kill, whenever a worker takes the job.
    lock = await database.superuser.connect();
    await lock.query("select pg_advisory_lock(hashtext('pooled_refresh:' || $1::text))", [farmId]);

    await commitSeasonLog(manager, first, seasonLog("CRASH", blocks));
    await first.kill();
    first = undefined;

    const { rows: state } = await database.superuser.query<{ waiting: boolean }>(
      "select requested > completed as waiting from pooled_refresh_state where farm_id = $1",
      [farmId],
    );
    expect(state).toEqual([{ waiting: true }]);
    expect(await storedBlocks()).toBe(before + blocks);
    expect(await pooledBlocks()).toBe(before);

    second = await startApp(database);
    // The same session cookies: the restarted server knows them, and the release panel says the upload is not in the statistics yet.
    expect(await updating(coordinator, second)).toBe(true);
    expect(await pooledBlocks()).toBe(before);

    await lock.query("select pg_advisory_unlock(hashtext('pooled_refresh:' || $1::text))", [farmId]);
    lock.release();
    lock = undefined;
    await vi.waitFor(async () => expect(await pooledBlocks()).toBe(before + blocks), { timeout: 60_000, interval: 250 });
    await vi.waitFor(async () => expect(await updating(coordinator, second!)).toBe(false), { timeout: 10_000, interval: 250 });
  });
});
