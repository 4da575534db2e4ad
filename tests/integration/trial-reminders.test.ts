import { sql } from "drizzle-orm";
import type { Pool } from "pg";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { closeDatabase, withFarmContext } from "@/db/client";
import { farmContextOf } from "@/lib/data/context";
import { loadMember, type Member } from "@/lib/data/members";
import { getCoordinatorHome, sweepTrialReminders } from "@/lib/data/trial-timeline";
import { getTrial, listTrialProgress, sendTrialReminder } from "@/lib/data/trials";
import { AppError } from "@/lib/errors";
import { todayUtc } from "@/lib/import/dates";
import { stopJobWorkers } from "@/lib/jobs/worker";
import { addDays } from "@/lib/trials/timeline";
import { CoopFixture } from "./adversarial/support/co-op-fixtures";
import { superuserPool } from "./support/database";

// The daily sweep reminds only farms the timeline says should hear, one reminder a day per farm
// even when two sweeps run at once, and none once the trial is closed.

let inspector: Pool;
let fixture: CoopFixture;
let coordinator: Member;
let trialId: string;
/** No blocks after the inoculation window closed: behind. */
let late: { id: string; manager: Member };
/** Every block and flush in: never reminded. */
let complete: { id: string; manager: Member };
/** Blocks in, flush 2 still to come before the due date: not behind. */
let onTime: { id: string; manager: Member };
/** Behind too, but asked for no reminders. */
let quiet: { id: string; manager: Member };

const today = todayUtc();

async function remindersOf(farmId: string) {
  const { rows } = await inspector.query<{ kind: string; reminded_on: string }>(
    "select kind, to_char(reminded_on, 'YYYY-MM-DD') as reminded_on from trial_reminders where trial_id = $1 and farm_id = $2",
    [trialId, farmId],
  );
  return rows;
}

async function mailTo(member: Member) {
  const { rows } = await inspector.query<{ subject: string }>(
    "select subject from outgoing_mail where kind = 'trial-reminder' and recipient = $1",
    [member.email],
  );
  return rows;
}

/** A new day for the sweep: forget today's reminders of this trial. */
async function forgetReminders() {
  await inspector.query("delete from trial_reminders where trial_id = $1", [trialId]);
}

beforeAll(async () => {
  inspector = superuserPool();
  fixture = new CoopFixture(inspector);
  const { rows } = await inspector.query<{ id: string }>("select id from users where email = 'coordinator@aldervalley.example'");
  coordinator = (await loadMember(rows[0].id))!;
  const species = await fixture.species("Reminder oyster", ["Reminder A", "Reminder B"]);
  [late, complete, onTime, quiet] = await Promise.all(["Late", "Complete", "On time", "Quiet"].map((name) => fixture.farm(`${name} Farm`)));
  const trial = await fixture.runningTrial(
    species.id,
    [
      { label: "A", strainId: species.strainIds[0], reference: true },
      { label: "B", strainId: species.strainIds[1] },
    ],
    [late.id, complete.id, onTime.id, quiet.id],
  );
  trialId = trial.id;
  await inspector.query(
    `update trials set inoculation_from = $2, inoculation_to = $3, fruiting_from = $4, fruiting_to = $5, data_due = $6 where id = $1`,
    [trialId, addDays(today, -40), addDays(today, -20), addDays(today, -10), addDays(today, 30), addDays(today, 45)],
  );
  await inspector.query("update trial_enrolments set reminders_allowed = false where trial_id = $1 and farm_id = $2", [trialId, quiet.id]);
  // 4 blocks per arm, 2 arms: 8 listed blocks per farm.
  for (const [farm, flushes] of [
    [complete, [300, 200]],
    [onTime, [300]],
  ] as const)
    for (const [index, armId] of trial.armIds.entries())
      await fixture.blocks(
        farm.id,
        species.strainIds[index],
        Array.from({ length: 4 }, () => ({ trialArmId: armId, flushes: [...flushes] })),
      );
});

afterAll(async () => {
  await inspector.query("delete from trial_reminders where trial_id = $1", [trialId]);
  await fixture.dispose();
  await inspector.end();
  await stopJobWorkers();
  await closeDatabase();
});

describe("the daily trial reminders", () => {
  it("count a farm behind only against the timeline", async () => {
    const trial = await getTrial(coordinator, trialId);
    const progress = await listTrialProgress(coordinator, trial);
    const byFarm = new Map(progress.map((row) => [row.farmId, row]));
    expect(byFarm.get(late.id)!.behindWhy).toEqual([
      `8 listed blocks are not in the season log, and the inoculation window closed on ${addDays(today, -20)}`,
    ]);
    expect(byFarm.get(complete.id)!.behind).toBe(false);
    // Flush 2 is still to come, but the data are not due yet: missing is not behind.
    expect(byFarm.get(onTime.id)!.due).toEqual(["flush 2 of 8 blocks"]);
    expect(byFarm.get(onTime.id)!.behind).toBe(false);
    expect(byFarm.get(quiet.id)!.behind).toBe(true);
  });

  it("send one reminder to the farm behind, even when two sweeps run at once, and none to the others", async () => {
    await Promise.all([sweepTrialReminders(), sweepTrialReminders()]);
    expect(await remindersOf(late.id)).toEqual([{ kind: "behind", reminded_on: today }]);
    expect(await mailTo(late.manager)).toHaveLength(1);
    for (const farm of [complete, onTime, quiet]) {
      expect(await remindersOf(farm.id)).toEqual([]);
      expect(await mailTo(farm.manager)).toEqual([]);
    }
    // A third sweep the same day sends nothing more, and neither does the coordinator's button.
    await sweepTrialReminders();
    expect(await mailTo(late.manager)).toHaveLength(1);
    const byHand = await sendTrialReminder(coordinator, trialId, late.id).catch((error: unknown) => error);
    expect(byHand).toBeInstanceOf(AppError);
    expect((byHand as AppError).message).toMatch(/already had a reminder about this trial today/);
    const { rows: audit } = await inspector.query<{ kind: string }>(
      "select details->>'kind' as kind from audit_events where action = 'trial.reminder_sent' and details->>'farmId' = $1",
      [late.id],
    );
    expect(audit).toEqual([{ kind: "behind" }]);
  });

  it("show the coordinator when each farm was last reminded", async () => {
    const progress = await listTrialProgress(coordinator, await getTrial(coordinator, trialId));
    expect(progress.find((row) => row.farmId === late.id)!.lastRemindedAt).toBeInstanceOf(Date);
    expect(progress.find((row) => row.farmId === complete.id)!.lastRemindedAt).toBeNull();
  });

  it("remind a farm with data missing in the week before the due date", async () => {
    await forgetReminders();
    await inspector.query("update trials set data_due = $2 where id = $1", [trialId, addDays(today, 3)]);
    await sweepTrialReminders();
    expect(await remindersOf(onTime.id)).toEqual([{ kind: "before-due", reminded_on: today }]);
    expect(await remindersOf(complete.id)).toEqual([]);
    expect(await remindersOf(quiet.id)).toEqual([]);
  });

  it("send none once the trial is closed, even to a sweep that read the trial while it was still running", async () => {
    await forgetReminders();
    const before = (await mailTo(late.manager)).length;
    const closing = await inspector.connect();
    try {
      await closing.query("begin");
      await closing.query("update trials set status = 'collecting' where id = $1", [trialId]);
      const sweep = sweepTrialReminders();
      // The sweep reads the farms (the close is not committed yet) and waits on the trial's row to claim.
      await new Promise((resolve) => setTimeout(resolve, 500));
      await closing.query("commit");
      await sweep;
    } finally {
      closing.release();
    }
    expect(await remindersOf(late.id)).toEqual([]);
    expect(await mailTo(late.manager)).toHaveLength(before);
    await sweepTrialReminders();
    expect(await remindersOf(late.id)).toEqual([]);
  });

  it("let only the coordinator read the farms' data status", async () => {
    await inspector.query("update trials set status = 'running' where id = $1", [trialId]);
    const home = await getCoordinatorHome(coordinator);
    const ours = home.running.find((trial) => trial.id === trialId)!;
    const completeRow = ours.farms.find((farm) => farm.farmId === complete.id)!;
    expect(completeRow).toMatchObject({ harvests: 16, lastHarvestedOn: "2026-02-15", progress: { blocksMade: 8, blocksListed: 8 } });
    expect(JSON.stringify(completeRow)).not.toMatch(/mass|efficiency/i);
    expect(home.attention.map((item) => item.text)).toEqual(
      expect.arrayContaining([expect.stringMatching(/^Late Farm .* is behind/), "The data are due"]),
    );
    await expect(getCoordinatorHome(late.manager)).rejects.toThrow(/Only the co-op's coordinator/);
    // The function itself answers a farm's context with nothing.
    const rows = await withFarmContext(
      farmContextOf(late.manager),
      async (tx) => (await tx.execute(sql`select * from app_trial_farm_status()`)).rows,
    );
    expect(rows).toEqual([]);
    // Nor can a farm claim a reminder.
    const enrolmentId = (await enrolmentOf(late.id)).id;
    const claimed = await withFarmContext(
      farmContextOf(late.manager),
      async (tx) => (await tx.execute(sql`select * from app_claim_trial_reminder(${enrolmentId}::uuid, 'behind')`)).rows,
    );
    expect(claimed).toEqual([]);
  });
});

async function enrolmentOf(farmId: string) {
  const { rows } = await inspector.query<{ id: string }>("select id from trial_enrolments where trial_id = $1 and farm_id = $2", [
    trialId,
    farmId,
  ]);
  return rows[0];
}
