import { sql } from "drizzle-orm";
import { Pool } from "pg";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { closeDatabase, withAnalystAccess, withFarmContext } from "@/db/client";
import { loadMember, type Member } from "@/lib/data/members";
import { refreshPooledStatistics } from "@/lib/data/pooled-refresh";
import { getPooledResults } from "@/lib/data/pooled-results";
import { cutReleaseIfDue, cutReleaseNow, cutSetupRelease, getReleaseStatus } from "@/lib/data/pooled-releases";
import { CoopFixture } from "./adversarial/support/co-op-fixtures";
import { databaseRefusal, ownerUrlFor, removeAllReleases, superuserPool } from "./support/database";

let inspector: Pool;
let fixture: CoopFixture;
let coordinator: Member;
let observer: Member;

async function memberByEmail(email: string): Promise<Member> {
  const { rows } = await inspector.query<{ id: string }>("select id from users where email = $1", [email]);
  return (await loadMember(rows[0].id))!;
}

const releaseCount = async () => (await inspector.query<{ n: number }>("select count(*)::int as n from pooled_releases")).rows[0].n;

/**
 * Three fixture farms each add a block of the strain, dried and fruited in the farm's room, so the
 * next release may change its figures (the drying ratio and the regime's among them).
 */
async function threeFarmsUpload(strainId: string, farmIds: string[], grams: number) {
  for (const [index, farmId] of farmIds.entries()) {
    const [block] = await fixture.blocks(farmId, strainId, [{ flushes: [grams, grams / 2], dried: [grams / 10, grams / 20] }]);
    await fixture.move(farmId, [block], roomIds[index]);
    await refreshPooledStatistics(farmId);
  }
}

let species: { id: string; strainIds: string[] };
let farmIds: string[];
let roomIds: string[];

beforeAll(async () => {
  inspector = superuserPool();
  fixture = new CoopFixture(inspector);
  coordinator = await memberByEmail("coordinator@aldervalley.example");
  observer = await memberByEmail("observer@extension.example");
  // Start from a first release of everything as it is now, so only this file's changes are pending.
  await inspector.query("select pooled_refresh_all()");
  await removeAllReleases(inspector);
  await cutSetupRelease();
  species = await fixture.species("Release oyster", ["Tidewater"]);
  farmIds = (await Promise.all([1, 2, 3].map((n) => fixture.farm(`Release farm ${n}`)))).map((farm) => farm.id);
  const soaked = await fixture.regimeKind("Soaked for releases");
  roomIds = await Promise.all(farmIds.map((farmId) => fixture.room(farmId, [{ startsOn: "2026-01-01", regimeKindId: soaked }])));
  await threeFarmsUpload(species.strainIds[0], farmIds, 700);
  await cutReleaseNow(coordinator);
});

afterAll(async () => {
  await inspector.query("update cooperative_settings set release_schedule = 'daily', release_hour = 2");
  await inspector.query("update pooled_release_schedule set last_attempt_at = null, last_outcome = null");
  await fixture.dispose();
  await cutReleaseNow(coordinator);
  await inspector.end();
  await closeDatabase();
});

describe("a release of the pooled figures", () => {
  it("cannot be changed or removed, not even by the owner of the tables or a superuser", async () => {
    const statements = [
      "update pooled_releases set minimum_farms = 1",
      "delete from pooled_releases",
      "update pooled_release_strain_rows set efficiency_sum = 0",
      "delete from pooled_release_flush_rows",
      "update pooled_release_season_rows set efficiency_sum = 0",
      "delete from pooled_release_season_rows",
      "truncate pooled_release_strain_rows",
      "truncate pooled_release_season_rows",
      "update pooled_release_drying_rows set ratio_sum = 0",
      "delete from pooled_release_regime_rows",
      "truncate pooled_release_regime_rows",
      "truncate pooled_release_drying_rows",
    ];
    // The superuser sees past row-level security, so only the refusing triggers stand in its way.
    for (const statement of statements) expect(await databaseRefusal(inspector.query(statement))).toMatch(/cannot be changed or removed/);
    // The owner is held by forced row-level security (no policy lets it see a release) and, for TRUNCATE, by the trigger.
    const owner = new Pool({ connectionString: ownerUrlFor(process.env.RHIZO_DATABASE ?? "postgres"), max: 1 });
    try {
      for (const statement of statements.filter((statement) => !statement.startsWith("truncate"))) {
        expect((await owner.query(statement)).rowCount).toBe(0);
      }
      expect(await databaseRefusal(owner.query("truncate pooled_release_flush_rows"))).toMatch(/cannot be changed or removed/);
    } finally {
      await owner.end();
    }
    expect(await databaseRefusal(withAnalystAccess((tx) => tx.execute(sql`delete from pooled_release_strain_rows`)))).toMatch(
      /permission denied/,
    );
    expect(await databaseRefusal(withAnalystAccess((tx) => tx.execute(sql`update pooled_releases set minimum_farms = 1`)))).toMatch(
      /permission denied/,
    );
  });

  it("is read only through the analyst role: no member's context can read a release's per-farm rows", async () => {
    for (const context of [
      { userId: coordinator.id, farmId: null, role: "coordinator" as const },
      { userId: observer.id, farmId: null, role: "observer" as const },
      { userId: coordinator.id, farmId: farmIds[0], role: "farm_manager" as const },
    ]) {
      for (const table of [
        "pooled_releases",
        "pooled_release_strain_rows",
        "pooled_release_flush_rows",
        "pooled_release_season_rows",
        "pooled_release_drying_rows",
        "pooled_release_regime_rows",
        "pooled_release_schedule",
      ]) {
        expect(await databaseRefusal(withFarmContext(context, (tx) => tx.execute(sql.raw(`select * from ${table} limit 1`))))).toMatch(
          /permission denied/,
        );
      }
    }
  });

  it("is cut once when two processes ask at the same time", async () => {
    await threeFarmsUpload(species.strainIds[0], farmIds, 820);
    const before = await releaseCount();
    const attempts = await Promise.all([cutReleaseNow(coordinator), cutReleaseNow(coordinator)]);
    expect(attempts.map((attempt) => attempt.outcome).sort()).toEqual(["cut", "unchanged"]);
    expect(await releaseCount()).toBe(before + 1);
    const { rows } = await inspector.query<{ action: string }>(
      "select action from audit_events where action like 'pooled-release.%' order by id desc limit 2",
    );
    expect(rows.map((row) => row.action).sort()).toEqual(["pooled-release.checked", "pooled-release.cut"]);
  });

  it("is what the results page shows, and a new release shows at the next request", async () => {
    const before = await getPooledResults(observer, { speciesId: species.id, flushWindow: "all" });
    const blocksBefore = before.results!.strains[0].blocks;
    await threeFarmsUpload(species.strainIds[0], farmIds, 910);
    // Cut, but not yet released: the page still shows the old release and its figures.
    expect((await getPooledResults(observer, { speciesId: species.id, flushWindow: "all" })).results!.strains[0].blocks).toEqual(
      blocksBefore,
    );
    const attempt = await cutReleaseNow(coordinator);
    if (attempt.outcome !== "cut") throw new Error("three farms changed: the release should be cut");
    const after = await getPooledResults(observer, { speciesId: species.id, flushWindow: "all" });
    expect(after.release).toEqual(attempt.release);
    expect(after.release!.number).toBe(before.release!.number + 1);
    expect(after.results!.strains[0].blocks).toEqual({
      status: "published",
      value: (blocksBefore.status === "published" ? blocksBefore.value : 0) + 3,
    });
  });
});

describe("the scheduled release", () => {
  it("is tried once per slot, and once only when two processes run the job together", async () => {
    await inspector.query("update cooperative_settings set release_schedule = 'daily', release_hour = 2");
    await inspector.query("update pooled_release_schedule set last_attempt_at = null");
    const night = new Date("2099-03-10T02:30:00Z");
    const both = await Promise.all([cutReleaseIfDue(night), cutReleaseIfDue(night)]);
    expect(both.filter((attempt) => attempt.outcome === "not_due")).toHaveLength(1);
    expect(await cutReleaseIfDue(new Date("2099-03-11T01:59:00Z"))).toEqual({ outcome: "not_due", nextDueAt: "2099-03-11T02:00:00.000Z" });
    await threeFarmsUpload(species.strainIds[0], farmIds, 640);
    const next = await cutReleaseIfDue(new Date("2099-03-11T02:00:00Z"));
    expect(next.outcome).toBe("cut");
    const status = await getReleaseStatus(coordinator, new Date("2099-03-11T02:05:00Z"));
    expect(status.lastAttempt).toEqual({ at: "2099-03-11T02:00:00.000Z", outcome: "cut" });
    expect(status.nextDueAt).toBe("2099-03-12T02:00:00.000Z");
  });

  it("waits with one farm's change, and never comes when the co-op cuts releases by hand", async () => {
    await inspector.query("update pooled_release_schedule set last_attempt_at = null");
    await fixture.blocks(farmIds[0], species.strainIds[0], [{ flushes: [777, 333] }]);
    await refreshPooledStatistics(farmIds[0]);
    const before = await releaseCount();
    const attempt = await cutReleaseIfDue(new Date("2099-04-01T03:00:00Z"));
    expect(attempt.outcome).toBe("waiting");
    if (attempt.outcome !== "waiting") return;
    expect(attempt.farmsChanged).toBe(1);
    expect(attempt.waiting).toEqual([expect.objectContaining({ strainName: "Tidewater", farmsChanged: 1 })]);
    expect(await releaseCount()).toBe(before);

    await inspector.query("update cooperative_settings set release_schedule = 'manual'");
    expect(await cutReleaseIfDue(new Date("2099-04-02T03:00:00Z"))).toEqual({ outcome: "not_due", nextDueAt: null });
  });

  it("comes at the hour on the clocks of the zone it was set in, not at that hour in UTC", async () => {
    // 02:00 in Tokyo (UTC+9 all year, tz database) is 17:00 UTC the day before.
    await inspector.query("update cooperative_settings set release_schedule = 'daily', release_hour = 2, release_time_zone = 'Asia/Tokyo'");
    await inspector.query("update pooled_release_schedule set last_attempt_at = $1", [new Date("2099-05-01T17:00:00Z")]);
    try {
      expect(await cutReleaseIfDue(new Date("2099-05-02T02:30:00Z"))).toEqual({
        outcome: "not_due",
        nextDueAt: "2099-05-02T17:00:00.000Z",
      });
      expect((await cutReleaseIfDue(new Date("2099-05-02T17:00:00Z"))).outcome).not.toBe("not_due");
      expect((await getReleaseStatus(coordinator, new Date("2099-05-02T17:05:00Z"))).nextDueAt).toBe("2099-05-03T17:00:00.000Z");
    } finally {
      await inspector.query("update cooperative_settings set release_time_zone = 'UTC'");
    }
  });
});
