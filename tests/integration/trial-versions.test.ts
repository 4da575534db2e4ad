import { sql } from "drizzle-orm";
import type { Pool } from "pg";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { closeDatabase, withFarmContext } from "@/db/client";
import { farmContextOf } from "@/lib/data/context";
import { loadMember, type Member } from "@/lib/data/members";
import { amendPublishedAnalysis, getCloseReview, getTrial, moveTrial, runTrialAnalysis, type AnalysisRunView } from "@/lib/data/trials";
import { CoopFixture, type FixtureBlock } from "./adversarial/support/co-op-fixtures";
import { databaseRefusal, superuserPool } from "./support/database";

// Analysis versions: every run kept with what it read; publishing freezes the run the coordinator
// picks; a correction is an amendment with a reason, above the original, which stays readable, and
// only on changes from no farm or from the co-op's minimum number of farms.
// Attacks replayed here: a coordinator (or anyone with the app role) rewriting or deleting a
// published run by SQL; an observer or a farm reading a run nobody published; a farm manager
// running or publishing the analysis; an amendment after one farm's late records, whose difference
// from the original would show that farm's blocks.

let inspector: Pool;
let fixture: CoopFixture;
let coordinator: Member;
let observer: Member;
let farms: { id: string; manager: Member }[];
let trialId: string;
let armIds: string[];
/** One block per farm that has given flush 1 only, farm by farm. */
const unfinishedBlockIds: string[] = [];
let run1: AnalysisRunView;
let run2: AnalysisRunView;
let run3: AnalysisRunView;

async function memberByEmail(email: string): Promise<Member> {
  const { rows } = await inspector.query<{ id: string }>("select id from users where email = $1", [email]);
  return (await loadMember(rows[0].id))!;
}

/** Three blocks of an arm on one farm, BE over flushes 1–2 about `be` (1 000 g dry substrate each); not whole numbers. */
const armBlocks = (armId: string, be: number): FixtureBlock[] =>
  [-2.13, 0.37, 1.91].map((offset) => ({ trialArmId: armId, flushes: [(be + offset) * 7, (be + offset) * 3] }));

async function storedRuns() {
  const { rows } = await inspector.query<{ id: string; run: number; results: unknown; fingerprint: string }>(
    "select id, run, results, fingerprint from trial_analyses where trial_id = $1 order by run",
    [trialId],
  );
  return rows;
}

/** Flush 2 of farm `index`'s unfinished block arrives. */
async function lateFlush(index: number) {
  await inspector.query(
    "insert into harvests (farm_id, block_id, flush, harvested_on, fresh_mass_g) values ($1, $2, 2, date '2026-02-15', $3)",
    [farms[index].id, unfinishedBlockIds[index], 240 + index],
  );
}

async function refusal(work: Promise<unknown>, expected: RegExp) {
  expect(await databaseRefusal(work)).toMatch(expected);
}

beforeAll(async () => {
  inspector = superuserPool();
  fixture = new CoopFixture(inspector);
  coordinator = await memberByEmail("coordinator@aldervalley.example");
  observer = await memberByEmail("observer@extension.example");
  const species = await fixture.species("Versioned oyster", ["Version strain A", "Version strain B"]);
  farms = await Promise.all([1, 2, 3].map((n) => fixture.farm(`Version farm ${n}`)));
  const trial = await fixture.runningTrial(
    species.id,
    [
      { label: "A", strainId: species.strainIds[0], reference: true },
      { label: "B", strainId: species.strainIds[1] },
    ],
    farms.map((farm) => farm.id),
  );
  trialId = trial.id;
  armIds = trial.armIds;
  for (const [index, farm] of farms.entries()) {
    await fixture.blocks(farm.id, species.strainIds[0], armBlocks(armIds[0], 70 + index));
    await fixture.blocks(farm.id, species.strainIds[1], armBlocks(armIds[1], 76 + index));
    // One block per farm has given flush 1 only: left out as unfinished until flush 2 arrives.
    unfinishedBlockIds.push(...(await fixture.blocks(farm.id, species.strainIds[1], [{ trialArmId: armIds[1], flushes: [560 + index] }])));
  }
});

afterAll(async () => {
  await fixture.dispose();
  await inspector.end();
  await closeDatabase();
});

describe("runs of a trial's analysis", () => {
  it("keeps the run closing makes, with when, who and what it read", async () => {
    expect(await runTrialAnalysis(coordinator, trialId).catch((error: Error) => error.message)).toMatch(/once the trial is closed/);
    await moveTrial(coordinator, trialId, "collecting", { reviewed: (await getCloseReview(coordinator, trialId)).fingerprint });
    const trial = await getTrial(coordinator, trialId);
    expect(trial.runs).toHaveLength(1);
    run1 = trial.runs[0];
    expect(run1).toMatchObject({
      run: 1,
      ranByName: coordinator.name,
      publication: null,
      // 21 blocks, 18 through flush 2 and three with flush 1 only (39 harvest records).
      inputs: { farms: 3, blocks: 21, harvests: 39, compared: 18, leftOut: 3 },
    });
    expect(run1.fingerprint).toMatch(/^[0-9a-f]{32}$/);
    expect(trial.shownRun?.id).toBe(run1.id);
    expect(trial.results?.analysis.blocksAnalysed).toBe(18);
  });

  it("refuses a run on records that have not changed", async () => {
    expect(await runTrialAnalysis(coordinator, trialId).catch((error: Error) => error.message)).toMatch(/Nothing has changed since run 1/);
    expect(await storedRuns()).toHaveLength(1);
  });

  it("keeps a second run when late records arrive, beside the first, each with its own counts and fingerprint", async () => {
    await lateFlush(2);
    expect(await runTrialAnalysis(coordinator, trialId)).toBe(2);
    const trial = await getTrial(coordinator, trialId);
    expect(trial.runs.map((run) => run.run)).toEqual([2, 1]);
    run2 = trial.runs[0];
    expect(run2.inputs).toMatchObject({ farms: 3, blocks: 21, harvests: 40, compared: 19, leftOut: 2 });
    expect(trial.runs[1]).toEqual(run1);
    expect(run2.fingerprint).not.toBe(run1.fingerprint);
    // The coordinator sees the newest run by default and any earlier one on asking.
    expect(trial.shownRun?.run).toBe(2);
    expect(trial.results?.analysis.blocksAnalysed).toBe(19);
    expect((await getTrial(coordinator, trialId, { run: 1 })).results?.analysis.blocksAnalysed).toBe(18);
    // The other two farms' late records make run 3.
    await lateFlush(0);
    await lateFlush(1);
    expect(await runTrialAnalysis(coordinator, trialId)).toBe(3);
    run3 = (await getTrial(coordinator, trialId)).runs[0];
    expect(run3.inputs).toMatchObject({ farms: 3, blocks: 21, harvests: 42, compared: 21, leftOut: 0 });
    const stored = await storedRuns();
    expect(stored.map((row) => row.run)).toEqual([1, 2, 3]);
    // Each run drew its own pseudonyms, one row per farm and run.
    const { rows } = await inspector.query<{ n: number }>("select count(*)::int as n from trial_report_farms where trial_id = $1", [
      trialId,
    ]);
    expect(rows[0].n).toBe(9);
    const { rows: events } = await inspector.query<{ details: { run: number; inputs: unknown } }>(
      "select details from audit_events where action = 'trial.analysed' and details->>'trialId' = $1 order by occurred_at",
      [trialId],
    );
    expect(events.map((event) => event.details.run)).toEqual([1, 2, 3]);
  });

  it("shows an observer and a farm no run that is not published, through the app or by SQL", async () => {
    for (const viewer of [observer, farms[0].manager]) {
      for (const run of [undefined, 1, 2, 3]) {
        const trial = await getTrial(viewer, trialId, { run });
        expect(trial.results).toBeNull();
        expect(trial.runs).toEqual([]);
        expect(trial.versions).toEqual([]);
      }
      const seen = await withFarmContext(farmContextOf(viewer), async (tx) => ({
        runs: (await tx.execute(sql`select id from trial_analyses where trial_id = ${trialId}`)).rows,
        farms: (await tx.execute(sql`select pseudonym from trial_report_farms where trial_id = ${trialId}`)).rows,
      }));
      expect(seen).toEqual({ runs: [], farms: [] });
    }
  });

  it("lets no farm manager or observer run, publish or amend the analysis", async () => {
    for (const attacker of [farms[0].manager, observer]) {
      await expect(runTrialAnalysis(attacker, trialId)).rejects.toMatchObject({ code: "forbidden" });
      await expect(moveTrial(attacker, trialId, "published", { analysisId: run2.id })).rejects.toMatchObject({ code: "forbidden" });
      await expect(
        amendPublishedAnalysis(attacker, trialId, { analysisId: run2.id, reason: "A farm's own correction of the trial" }),
      ).rejects.toMatchObject({ code: "forbidden" });
      // Straight to the tables as the app role in their own context.
      await refusal(
        withFarmContext(farmContextOf(attacker), (tx) =>
          tx.execute(
            sql`insert into trial_publications (trial_id, analysis_id, version, published_by_name) values (${trialId}, ${run2.id}, 1, 'x')`,
          ),
        ),
        /row-level security/,
      );
      await refusal(
        withFarmContext(farmContextOf(attacker), (tx) =>
          tx.execute(sql`insert into trial_analyses (trial_id, run, ran_by_name, results) values (${trialId}, 4, 'x', '{}')`),
        ),
        /row-level security/,
      );
    }
    const { rows } = await inspector.query("select 1 from trial_publications where trial_id = $1", [trialId]);
    expect(rows).toEqual([]);
    expect(await storedRuns()).toHaveLength(3);
  });
});

describe("publishing and amending", () => {
  it("publishes the run the coordinator picks as version 1, for every member and observer", async () => {
    await moveTrial(coordinator, trialId, "published", { analysisId: run1.id });
    for (const viewer of [observer, farms[1].manager]) {
      const trial = await getTrial(viewer, trialId);
      expect(trial.versions.map((version) => [version.version, version.run.run, version.reason])).toEqual([[1, 1, null]]);
      expect(trial.shownRun?.run).toBe(1);
      expect(trial.results?.analysis.blocksAnalysed).toBe(18);
      // Runs 2 and 3 were not published: still nobody's but the coordinator's.
      expect(trial.runs.map((run) => run.run)).toEqual([1]);
      expect((await getTrial(viewer, trialId, { run: 3 })).shownRun?.run).toBe(1);
    }
    // A farm reads its own row of the published run only.
    const own = await withFarmContext(farmContextOf(farms[1].manager), (tx) =>
      tx.execute<{ analysis_id: string }>(sql`select analysis_id from trial_report_farms where trial_id = ${trialId}`),
    );
    expect(own.rows).toEqual([{ analysis_id: run1.id }]);
  });

  it("refuses every change to a published run or version, as the app role in the coordinator's or a farm's context", async () => {
    const before = await storedRuns();
    const attempts = [
      sql`update trial_analyses set results = '{"analysis": {}}'::jsonb where id = ${run1.id}`,
      sql`update trial_analyses set fingerprint = ${run2.fingerprint} where id = ${run1.id}`,
      sql`delete from trial_analyses where id = ${run1.id}`,
      sql`update trial_publications set analysis_id = ${run2.id} where analysis_id = ${run1.id}`,
      sql`delete from trial_publications where analysis_id = ${run1.id}`,
      sql`update trial_report_farms set pseudonym = 'Farm Z' where analysis_id = ${run1.id}`,
      sql`delete from trial_report_farms where analysis_id = ${run1.id}`,
      sql`delete from trials where id = ${trialId}`,
    ];
    for (const member of [coordinator, farms[0].manager]) {
      for (const attempt of attempts)
        await refusal(
          withFarmContext(farmContextOf(member), (tx) => tx.execute(attempt)),
          /permission denied/,
        );
    }
    // Nor may the coordinator slip pseudonyms of their choosing into a published run.
    await refusal(
      withFarmContext(farmContextOf(coordinator), (tx) =>
        tx.execute(
          sql`insert into trial_report_farms (trial_id, analysis_id, farm_id, pseudonym, own_estimates) values (${trialId}, ${run1.id}, ${farms[0].id}, 'Farm Z', '[]')`,
        ),
      ),
      /row-level security|duplicate key/,
    );
    // The trigger holds even for a role that may write the table (here the superuser).
    await expect(inspector.query("update trial_analyses set results = '{}'::jsonb where id = $1", [run1.id])).rejects.toThrow(
      /stay as they were made/,
    );
    await expect(inspector.query("delete from trial_publications where analysis_id = $1", [run1.id])).rejects.toThrow(
      /stay as they were made/,
    );
    expect(await storedRuns()).toEqual(before);
  });

  it("refuses an amendment whose difference from the version in force would show one farm's blocks", async () => {
    // Run 2 differs from run 1 by one farm's late flush only.
    await expect(
      amendPublishedAnalysis(coordinator, trialId, { analysisId: run2.id, reason: "Late flush 2 of Version farm 3 is in" }),
    ).rejects.toThrow(/records of one farm changed.*at least 3 farms/);
    const { rows } = await inspector.query("select 1 from trial_publications where trial_id = $1", [trialId]);
    expect(rows).toHaveLength(1);
  });

  it("asks an amendment for a run not yet published and a reason", async () => {
    await expect(
      amendPublishedAnalysis(coordinator, trialId, { analysisId: run1.id, reason: "Run 1 again, as an amendment" }),
    ).rejects.toThrow(/already published as version 1/);
    await expect(amendPublishedAnalysis(coordinator, trialId, { analysisId: run3.id, reason: "  late " })).rejects.toMatchObject({
      code: "invalid_input",
    });
    // Straight to the table: a later version without a reason is refused by the database too.
    await refusal(
      withFarmContext(farmContextOf(coordinator), (tx) =>
        tx.execute(
          sql`insert into trial_publications (trial_id, analysis_id, version, published_by_name) values (${trialId}, ${run3.id}, 2, 'x')`,
        ),
      ),
      /trial_publications_reason/,
    );
  });

  it("publishes the amendment above the original, which stays readable as it was published", async () => {
    const original = (await storedRuns())[0].results;
    const reason = "Flush 2 of one block on each farm arrived after publication";
    expect(await amendPublishedAnalysis(coordinator, trialId, { analysisId: run3.id, reason })).toEqual({ version: 2 });
    for (const viewer of [observer, farms[2].manager, coordinator]) {
      const trial = await getTrial(viewer, trialId);
      expect(trial.versions.map((version) => [version.version, version.run.run])).toEqual([
        [2, 3],
        [1, 1],
      ]);
      expect(trial.versions[0].reason).toBe(reason);
      // The page shows the amendment in force; the original is below it, unchanged.
      expect(trial.shownRun?.run).toBe(3);
      expect(trial.results?.analysis.blocksAnalysed).toBe(21);
      expect(trial.versions[1].results.analysis.blocksAnalysed).toBe(18);
      if (!viewer.farmId) expect(trial.versions[1].results).toEqual(original);
    }
    const { rows } = await inspector.query<{ details: { version: number; reason: string } }>(
      "select details from audit_events where action = 'trial.amended' and details->>'trialId' = $1",
      [trialId],
    );
    expect(rows.map((row) => [row.details.version, row.details.reason])).toEqual([[2, reason]]);
    // Everyone told of the results is told of the amendment, one message each (queued with the amendment).
    const { rows: mail } = await inspector.query<{ recipient: string }>(
      "select recipient from outgoing_mail where kind = 'trial-results' and subject like $1",
      [`Amended results of trial ${(await getTrial(coordinator, trialId)).code}:%`],
    );
    const { rows: people } = await inspector.query<{ email: string }>("select email from users where active");
    expect(mail.map((row) => row.recipient).sort()).toEqual(people.map((person) => person.email).sort());
    await expect(amendPublishedAnalysis(coordinator, trialId, { analysisId: run3.id, reason })).rejects.toThrow(
      /already published as version 2/,
    );
  });
});
