import type { Pool } from "pg";
import { afterAll, beforeAll, describe, expect, it, vi } from "vitest";
import { changeGeneration, listenerApplicationName } from "@/db/change-feed";
import { closeDatabase } from "@/db/client";
import { loadMemberForRequest, updatePreferences, type Member } from "@/lib/data/members";
import { getPooledUpdating } from "@/lib/data/pooled-refresh";
import { getPooledResults } from "@/lib/data/pooled-results";
import { superuserPool } from "./support/database";

// The guard's member and the Co-op results are kept per process until PostgreSQL announces a
// change (migration 0010). These checks fail if a change goes unheard or if nothing is kept.

let inspector: Pool;
let observerId: string;

/** How long to wait for a notice to be heard: well past the listener's one-second reconnect. */
const patiently = { timeout: 5_000, interval: 50 };

const listening = () => changeGeneration("members") !== null;

beforeAll(async () => {
  inspector = superuserPool();
  const { rows } = await inspector.query<{ id: string }>("select id from users where email = 'observer@extension.example'");
  observerId = rows[0].id;
  // The first question starts the listener.
  await vi.waitFor(() => expect(listening()).toBe(true), patiently);
});

afterAll(async () => {
  await inspector.query("update users set display_units = 'metric' where id = $1", [observerId]);
  await inspector.end();
  await closeDatabase();
});

describe("the guard's copy of a member", () => {
  it("is kept between requests", async () => {
    const first = await loadMemberForRequest(observerId);
    expect(first?.email).toBe("observer@extension.example");
    expect(await loadMemberForRequest(observerId)).toBe(first);
  });

  it("is dropped before this process's own change returns, so the next render already sees it", async () => {
    const before = (await loadMemberForRequest(observerId)) as Member;
    const other = before.displayUnits === "metric" ? "imperial" : "metric";
    await updatePreferences(before, { displayUnits: other, notifyReminders: true });
    // No waiting here: the session's own notice comes before PostgreSQL reports the commit.
    expect((await loadMemberForRequest(observerId))?.displayUnits).toBe(other);
  });

  it("is dropped when someone outside the app changes the row", async () => {
    const before = (await loadMemberForRequest(observerId)) as Member;
    const other = before.displayUnits === "metric" ? "imperial" : "metric";
    await inspector.query("update users set display_units = $2 where id = $1", [observerId, other]);
    await vi.waitFor(async () => expect((await loadMemberForRequest(observerId))?.displayUnits).toBe(other), patiently);
  });

  it("is kept through writes to what the guard does not read (the sign-in time)", async () => {
    // Notices of earlier tests' writes are heard first, so none of them can drop the copy taken below.
    const settled = changeGeneration("pooled-statistics");
    await inspector.query("update cooperative_settings set updated_at = now()");
    await vi.waitFor(() => expect(changeGeneration("pooled-statistics")).not.toBe(settled), patiently);
    const before = await loadMemberForRequest(observerId);
    const statisticsGeneration = changeGeneration("pooled-statistics");
    await inspector.query("update users set last_sign_in_at = now() where id = $1", [observerId]);
    // Notices arrive in commit order: once this later one is heard, a notice from the update above would have been too.
    await inspector.query("update cooperative_settings set updated_at = now()");
    await vi.waitFor(() => expect(changeGeneration("pooled-statistics")).not.toBe(statisticsGeneration), patiently);
    expect(await loadMemberForRequest(observerId)).toBe(before);
  });

  it("is not kept while the listener is disconnected, and is kept again once it reconnects", async () => {
    const { rowCount } = await inspector.query(
      "select pg_terminate_backend(pid) from pg_stat_activity where application_name = $1 and datname = current_database()",
      [listenerApplicationName],
    );
    expect(rowCount).toBeGreaterThan(0);
    await vi.waitFor(() => expect(listening()).toBe(false), patiently);
    const first = await loadMemberForRequest(observerId);
    expect(await loadMemberForRequest(observerId)).not.toBe(first);
    await vi.waitFor(() => expect(listening()).toBe(true), patiently);
    const kept = await loadMemberForRequest(observerId);
    expect(await loadMemberForRequest(observerId)).toBe(kept);
  });
});

describe("the kept Co-op results", () => {
  it("follow the co-op's settings and the refresh state as PostgreSQL announces them", async () => {
    const observer = (await loadMemberForRequest(observerId)) as Member;
    const { rows } = await inspector.query<{ minimum_farms: number }>("select minimum_farms from cooperative_settings");
    const minimumFarms = rows[0].minimum_farms;
    const query = { flushWindow: "all" } as const;
    const before = await getPooledResults(observer, query);
    expect(before.results?.minimumFarms).toBe(minimumFarms);
    expect((await getPooledResults(observer, query)).results).toBe(before.results);
    try {
      await inspector.query("update cooperative_settings set minimum_farms = $1", [minimumFarms + 40]);
      await vi.waitFor(
        async () => expect((await getPooledResults(observer, query)).results?.minimumFarms).toBe(minimumFarms + 40),
        patiently,
      );
      expect((await getPooledResults(observer, query)).results?.strains.every((strain) => strain.efficiency.status === "suppressed")).toBe(
        true,
      );
    } finally {
      await inspector.query("update cooperative_settings set minimum_farms = $1", [minimumFarms]);
    }

    await vi.waitFor(async () => expect(await getPooledUpdating()).toBe(false), patiently);
    const { rows: farms } = await inspector.query<{ id: string }>("select id from farms limit 1");
    try {
      await inspector.query(
        `insert into pooled_refresh_state (farm_id, requested, completed) values ($1, 1, 0)
         on conflict (farm_id) do update set requested = pooled_refresh_state.completed + 1`,
        [farms[0].id],
      );
      await vi.waitFor(async () => expect(await getPooledUpdating()).toBe(true), patiently);
    } finally {
      await inspector.query("update pooled_refresh_state set requested = completed where farm_id = $1", [farms[0].id]);
    }
    await vi.waitFor(async () => expect(await getPooledUpdating()).toBe(false), patiently);
  });

  it("keep a farm's own blocks until its harvests change", async () => {
    const { rows } = await inspector.query<{ id: string; farm_id: string; species_id: string }>(
      `select u.id, u.farm_id, s.species_id from users u
       join blocks b on b.farm_id = u.farm_id and not b.contaminated and exists (select 1 from harvests h where h.block_id = b.id)
       join strains s on s.id = b.strain_id
       where u.role = 'farm_manager' order by u.email, b.id limit 1`,
    );
    const manager = (await loadMemberForRequest(rows[0].id)) as Member;
    const query = { speciesId: rows[0].species_id, flushWindow: "all" } as const;
    const dots = async () =>
      (await getPooledResults(manager, query)).ownBlocks.flatMap((strain) => strain.efficiencies).sort((a, b) => a - b);
    const before = await dots();
    expect(before.length).toBeGreaterThan(0);
    try {
      // Every harvest of the farm: with more than 100 blocks of a strain the chart shows 100 of them
      // spread by rank, so one block's change might not move a dot that is drawn.
      await inspector.query("update harvests set fresh_mass_g = fresh_mass_g + 500 where farm_id = $1", [rows[0].farm_id]);
      await vi.waitFor(async () => expect(await dots()).not.toEqual(before), patiently);
    } finally {
      await inspector.query("update harvests set fresh_mass_g = fresh_mass_g - 500 where farm_id = $1", [rows[0].farm_id]);
    }
    await vi.waitFor(async () => expect(await dots()).toEqual(before), patiently);
  });
});
