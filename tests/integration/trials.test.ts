import { eq } from "drizzle-orm";
import type { Pool } from "pg";
import { afterAll, beforeAll, describe, expect, it, vi } from "vitest";
import { closeDatabase, withFarmContext } from "@/db/client";
import { blocks, harvests, trialBlockAssignments, trialEnrolments } from "@/db/schema";
import { listOutgoingMail } from "@/lib/data/mail";
import { loadMember, type Member } from "@/lib/data/members";
import {
  getCloseReview,
  getOwnProgress,
  getTrial,
  inviteFarms,
  listOwnAssignments,
  listTrialProgress,
  moveTrial,
  optOutOfReminders,
  respondToInvitation,
  saveTrialDraft,
  sendTrialReminder,
  type TrialView,
} from "@/lib/data/trials";
import { AppError } from "@/lib/errors";
import { seededRandom } from "@/lib/random";
import { blockedAnova, biologicalEfficiency, wilsonInterval } from "@/lib/stats";
import { runQueuedJobs, stopJobWorkers } from "@/lib/jobs/worker";
import { permutedBlockList, trialSampleSize } from "@/lib/trials";
import { addDays } from "@/lib/trials/timeline";
import { todayUtc } from "@/lib/import/dates";
import { inbox } from "../support/mailbox";
import { superuserPool } from "./support/database";

let inspector: Pool;
const deadline = addDays(todayUtc(), 30);
let coordinator: Member;
let observer: Member;
let managers: Member[];
let outsider: Member;
let trialId: string;
let trial: TrialView;
let inboxBefore: Set<string>;

async function memberByEmail(email: string): Promise<Member> {
  const { rows } = await inspector.query<{ id: string }>("select id from users where lower(email) = lower($1)", [email]);
  const member = await loadMember(rows[0].id);
  if (!member) throw new Error(`no member ${email}`);
  return member;
}

/** The mail this file sent whose subject matches, once the mail job has sent what was queued; maildev stores a message just after taking it, so wait for it. */
async function caughtMail(subject: RegExp, expected: number) {
  await runQueuedJobs();
  return vi.waitFor(
    async () => {
      const found = (await inbox()).filter((mail) => !inboxBefore.has(mail.id) && subject.test(mail.subject));
      if (found.length < expected) throw new Error(`expected ${expected} messages like ${subject}, found ${found.length}`);
      return found.map((mail) => ({ recipients: mail.to, subject: mail.subject, text: mail.text, html: mail.html }));
    },
    { timeout: 10_000, interval: 100 },
  );
}

async function expectConflict(work: Promise<unknown>, message: RegExp) {
  const error = await work.then(
    () => null,
    (caught: unknown) => caught,
  );
  expect(error).toBeInstanceOf(AppError);
  expect((error as AppError).message).toMatch(message);
}

beforeAll(async () => {
  inspector = superuserPool();
  inboxBefore = new Set((await inbox()).map((mail) => mail.id));
  coordinator = await memberByEmail("coordinator@aldervalley.example");
  observer = await memberByEmail("observer@extension.example");
  managers = await Promise.all(
    ["manager@fernbrook.example", "manager@hollowoak.example", "manager@millcreek.example", "manager@stonebank.example"].map(memberByEmail),
  );
  outsider = await memberByEmail("manager@wrenfield.example");
});

afterAll(async () => {
  await inspector.end();
  await stopJobWorkers();
  await closeDatabase();
});

describe("a strain trial from design to publication", () => {
  it("saves the coordinator's design as a draft that members cannot see", async () => {
    const { rows: strainRows } = await inspector.query<{ id: string; code: string; species_id: string }>(
      "select id, code, species_id from strains where code in ('PO-01', 'PO-02', 'PO-03') order by code",
    );
    const saved = await saveTrialDraft(coordinator, {
      title: "Three oyster strains over two flushes",
      question: "Do PO-02 and PO-03 give a different BE over flushes 1–2 than PO-01?",
      speciesId: strainRows[0].species_id,
      arms: strainRows.map((strain, index) => ({
        label: ["A", "B", "C"][index],
        strainId: strain.id,
        treatmentId: null,
        isReference: index === 0,
      })),
      outcomeFlushes: 2,
      contaminatedHandling: "exclude",
      protocolNotes: "2.5 kg blocks of HWB-20.",
      enrolmentDeadline: deadline,
      // A timeline whose due date has passed, so a farm with records missing is behind.
      inoculationFrom: addDays(todayUtc(), -120),
      inoculationTo: addDays(todayUtc(), -100),
      fruitingFrom: addDays(todayUtc(), -80),
      fruitingTo: addDays(todayUtc(), -20),
      dataDue: addDays(todayUtc(), -1),
      smallestDifference: 10,
      expectedSd: 12,
      plannedFarms: 4,
      expectedLoss: 0.05,
    });
    trialId = saved.id;
    expect(saved.code).toMatch(/^T-\d{4}-\d{2}$/);
    await expectConflict(getTrial(managers[0], trialId), /no such trial/);
  });

  it("refuses illegal moves and records every legal one", async () => {
    await expectConflict(moveTrial(coordinator, trialId, "running"), /cannot move to "Running"/);
    await moveTrial(coordinator, trialId, "open");
    await expectConflict(moveTrial(coordinator, trialId, "published"), /cannot move to "Published"/);
    await expectConflict(moveTrial(coordinator, trialId, "running"), /No farm has accepted yet/);
    const { rows } = await inspector.query<{ details: unknown }>(
      "select details from audit_events where action = 'trial.status_changed' and details->>'trialId' = $1",
      [trialId],
    );
    expect(rows.map((row) => row.details)).toEqual([{ trialId, from: "draft", to: "open" }]);
  });

  it("invites farms by e-mail with a link to the trial and an unsubscribe link", async () => {
    // One manager chose a zone and a date style; the others did not (UTC, named, and ISO dates).
    await inspector.query("update users set time_zone = 'Asia/Tokyo', date_style = 'day-month-year' where id = $1", [managers[2].id]);
    const sent = await inviteFarms(
      coordinator,
      trialId,
      managers.map((manager) => manager.farmId!),
    );
    expect(sent).toBe(4);
    trial = await getTrial(coordinator, trialId);
    const mail = await caughtMail(new RegExp(`^Invitation to trial ${trial.code}`), 4);
    expect(mail.flatMap((message) => message.recipients).sort()).toEqual(managers.map((manager) => manager.email).sort());
    for (const message of mail) {
      expect(message.text).toContain(`${process.env.APP_URL}/trials/${trialId}`);
      expect(message.text).toMatch(new RegExp(`${process.env.APP_URL}/unsubscribe/[0-9a-f-]{36}\\.`));
      expect(message.html).toContain(`href="${process.env.APP_URL}/trials/${trialId}"`);
    }
    // What the design form's sample-size panel gives at 80 % power, per farm and arm.
    const panel = trialSampleSize({ difference: 10, sd: 12, plannedFarms: 4, expectedLoss: 0.05, arms: 3 }, [0.8]);
    if (!panel.ok) throw new Error("the design's sample size did not compute");
    const wanted = panel.rows[0].perFarmPerArm;
    expect(mail[0].text).toContain(`The trial asks each farm for ${wanted} blocks per arm: 3 arms, so ${wanted * 3} blocks in all.`);
    // Answers are taken through the deadline day in UTC. Tokyo is UTC+9 all year (tz database: no
    // summer time since 1951), so that day ends at 09:00 the next day there.
    const [year, month, day] = deadline.split("-");
    const [nextYear, nextMonth, nextDay] = addDays(deadline, 1).split("-");
    const textFor = (manager: Member) => mail.find((message) => message.recipients.includes(manager.email))!.text;
    expect(textFor(managers[2])).toContain(
      `Please answer by ${day}/${month}/${year} (answers are taken until ${nextDay}/${nextMonth}/${nextYear} 09:00 GMT+9)`,
    );
    expect(textFor(managers[0])).toContain(`Please answer by ${deadline} (answers are taken until ${addDays(deadline, 1)} 00:00 UTC)`);
    await inspector.query("update users set time_zone = null, date_style = 'iso' where id = $1", [managers[2].id]);
  });

  it("randomises each accepting farm by permuted blocks from a recorded seed, and confirms by e-mail", async () => {
    for (const manager of managers) await respondToInvitation(manager, trialId, { accept: true, blocksPerArm: 4 });
    for (const manager of managers) {
      const [enrolment] = await withFarmContext({ userId: manager.id, farmId: manager.farmId, role: "farm_manager" }, (tx) =>
        tx.select().from(trialEnrolments).where(eq(trialEnrolments.trialId, trialId)),
      );
      const stored = await withFarmContext({ userId: manager.id, farmId: manager.farmId, role: "farm_manager" }, (tx) =>
        tx.select().from(trialBlockAssignments).where(eq(trialBlockAssignments.trialId, trialId)).orderBy(trialBlockAssignments.sequence),
      );
      expect(stored).toHaveLength(12);
      const replayed = permutedBlockList({
        seed: enrolment.randomisationSeed!,
        armIds: trial.arms.map((arm) => arm.id),
        blocksPerArm: 4,
        codePrefix: stored[0].blockCode.replace(/-\d+$/, ""),
      });
      expect(stored.map((row) => [row.blockCode, row.armId, row.permutedBlock])).toEqual(
        replayed.map((entry) => [entry.blockCode, entry.armId, entry.permutedBlock]),
      );
      for (let run = 1; run <= 4; run++) {
        expect(
          stored
            .filter((row) => row.permutedBlock === run)
            .map((row) => row.armId)
            .sort(),
        ).toEqual(trial.arms.map((arm) => arm.id).sort());
      }
    }
    const confirmations = await caughtMail(new RegExp(` is enrolled in trial ${trial.code}$`), 4);
    expect(confirmations.map((message) => message.recipients[0]).sort()).toEqual(managers.map((manager) => manager.email).sort());
    expect(confirmations[0].text).toContain(`/trials/${trialId}/labels`);
  });

  it("never shows a farm another farm's list or progress", async () => {
    const [farmA, farmB] = managers;
    const own = await listOwnAssignments(farmA, trialId);
    expect(own).toHaveLength(12);
    const everything = await withFarmContext({ userId: farmA.id, farmId: farmA.farmId, role: "farm_manager" }, (tx) =>
      tx.select().from(trialBlockAssignments),
    );
    expect(new Set(everything.map((row) => row.farmId))).toEqual(new Set([farmA.farmId]));
    const theirs = await withFarmContext({ userId: farmA.id, farmId: farmA.farmId, role: "farm_manager" }, (tx) =>
      tx.select().from(trialEnrolments).where(eq(trialEnrolments.farmId, farmB.farmId!)),
    );
    expect(theirs).toEqual([]);
    expect(await listOwnAssignments(outsider, trialId)).toEqual([]);
    expect(await getOwnProgress(outsider, trial)).toBeNull();
    expect(await listOwnAssignments(observer, trialId)).toEqual([]);
  });

  it("follows farms by counts only and reminds a farm that is behind", async () => {
    await moveTrial(coordinator, trialId, "running");
    const effect: Record<string, number> = { A: 0, B: 10, C: -4 };
    for (const [farmIndex, manager] of managers.entries()) {
      const context = { userId: manager.id, farmId: manager.farmId, role: "farm_manager" as const };
      const list = await listOwnAssignments(manager, trialId);
      const farmEffect = [5, -6, 2, -1][farmIndex];
      // The arms' order in the list is drawn afresh each run; one stream of noise per farm and arm,
      // and the lost and the unfinished block always in arm A, keep the figures the same whatever that order.
      const noise = Object.fromEntries(["A", "B", "C"].map((label) => [label, seededRandom(`trial-integration-${farmIndex}-${label}`)]));
      const lostBlock = list.find((entry) => entry.armLabel === "A")!.sequence;
      const unfinishedBlock = list.findLast((entry) => entry.armLabel === "A")!.sequence;
      await withFarmContext(context, async (tx) => {
        for (const entry of list) {
          const arm = trial.arms.find((candidate) => candidate.label === entry.armLabel)!;
          const contaminated = entry.sequence === lostBlock;
          const [block] = await tx
            .insert(blocks)
            .values({
              farmId: manager.farmId!,
              code: entry.blockCode,
              strainId: arm.strainId,
              trialArmId: arm.id,
              wetMassG: 2500,
              moisture: 0.6,
              contaminated,
            })
            .returning({ id: blocks.id });
          if (contaminated) continue;
          const be = 80 + effect[arm.label] + farmEffect + noise[arm.label].normal(0, 6);
          // The last farm has not yet recorded flush 2 of one block.
          const flushes = farmIndex === 3 && entry.sequence === unfinishedBlock ? [1] : [1, 2, 3];
          await tx.insert(harvests).values(
            flushes.map((flush) => ({
              farmId: manager.farmId!,
              blockId: block.id,
              flush,
              freshMassG: ((1000 * be) / 100) * [0.6, 0.4, 0.2][flush - 1],
            })),
          );
        }
      });
    }
    const progress = await listTrialProgress(coordinator, trial);
    expect(progress).toHaveLength(4);
    for (const row of progress) {
      expect(row.progress).toMatchObject({ blocksListed: 12, blocksMade: 12, contaminated: 1, fruiting: 11 });
      expect(Object.keys(row.progress).sort()).toEqual(["blocksListed", "blocksMade", "contaminated", "flushesRecorded", "fruiting"]);
    }
    const behind = progress.filter((row) => row.behind);
    expect(behind.map((row) => row.farmId)).toEqual([managers[3].farmId]);
    expect(behind[0].due).toEqual(["flush 2 of 1 block"]);
    expect(behind[0].behindWhy[0]).toMatch(/were due on .* still missing: flush 2 of 1 block/);

    const own = await getOwnProgress(managers[3], trial);
    expect(own).toMatchObject({ blocksMade: 12, flushesRecorded: [11, 10] });

    await sendTrialReminder(coordinator, trialId, managers[3].farmId!);
    const [reminder] = await caughtMail(new RegExp(`^Reminder: trial ${trial.code}`), 1);
    expect(reminder.recipients).toEqual([managers[3].email]);
    expect(reminder.text).toContain("flush 2 of 1 block");
    await expectConflict(sendTrialReminder(coordinator, trialId, managers[0].farmId!), /nothing due/);
  });

  it("stops reminders from the e-mail's unsubscribe link, and only with a genuine link", async () => {
    const [reminder] = await caughtMail(new RegExp(`^Reminder: trial ${trial.code}`), 1);
    const token = reminder.text.match(/\/unsubscribe\/(\S+)/)![1];
    expect(await optOutOfReminders(token.replace(/.$/, (last) => (last === "A" ? "B" : "A")))).toBeNull();
    expect(await optOutOfReminders(token)).toBe(trial.code);
    const { rows } = await inspector.query<{ reminders_allowed: boolean }>(
      "select reminders_allowed from trial_enrolments where trial_id = $1 and farm_id = $2",
      [trialId, managers[3].farmId],
    );
    expect(rows[0].reminders_allowed).toBe(false);
    await expectConflict(sendTrialReminder(coordinator, trialId, managers[3].farmId!), /asked not to get reminders/);
  });

  it("shows the coordinator what is still incomplete per farm and arm before closing, as counts only", async () => {
    // Farm 2 (index 1) has one block of arm B still colonising, farm 3 (index 2) one of arm B without its wet mass.
    const armB = trial.arms.find((arm) => arm.label === "B")!;
    await inspector.query(
      `delete from harvests where block_id = (select id from blocks where farm_id = $1 and trial_arm_id = $2 order by code limit 1)`,
      [managers[1].farmId, armB.id],
    );
    await inspector.query(
      `update blocks set wet_mass_g = null where id = (select id from blocks where farm_id = $1 and trial_arm_id = $2 order by code limit 1)`,
      [managers[2].farmId, armB.id],
    );
    const review = await getCloseReview(coordinator, trialId);
    expect(review.rows).toHaveLength(4 * 3);
    const row = (manager: Member, arm: string) =>
      review.rows.find((entry) => entry.farmId === manager.farmId && entry.armLabel === arm)!.counts;
    expect(row(managers[3], "A")).toMatchObject({ listed: 4, inSeasonLog: 4, withoutOutcomeFlushes: 1, contaminated: 1, wouldCount: 2 });
    expect(row(managers[3], "A").leftOut).toEqual({ contaminated: 1, lost: 0, unfinished: 1, no_harvest: 0 });
    expect(row(managers[1], "B")).toMatchObject({ withoutOutcomeFlushes: 1, wouldCount: 3, leftOut: { unfinished: 1 } });
    expect(row(managers[2], "B")).toMatchObject({ withoutMass: 1, wouldCount: 3, leftOut: { lost: 1 } });
    // No block has a spent mass yet: every uncontaminated block is "not yet spent", and those through flush 2 still count.
    expect(review.totals).toMatchObject({ listed: 48, notInSeasonLog: 0, notSpent: 44, wouldCount: 41 });
    expect(review.totals.leftOut).toEqual({ contaminated: 4, lost: 1, unfinished: 2, no_harvest: 0 });
    // Counts only: no mass or block id of any farm is in what the page receives.
    const shown = JSON.stringify(review);
    expect(shown).not.toMatch(/2500|freshMass|wetMass|blockId/);
    const { rows: blockIds } = await inspector.query<{ id: string }>("select id from blocks where trial_arm_id = any($1::uuid[])", [
      trial.arms.map((arm) => arm.id),
    ]);
    expect(blockIds.some((block) => shown.includes(block.id))).toBe(false);
  });

  it("refuses to close without the coordinator's confirmation, or on counts that changed since", async () => {
    await expectConflict(moveTrial(coordinator, trialId, "collecting"), /tick the confirmation/);
    await expectConflict(moveTrial(coordinator, trialId, "collecting", { reviewed: "0".repeat(32) }), /Records have changed/);
    const { rows } = await inspector.query<{ status: string; runs: number }>(
      "select status, (select count(*)::int from trial_analyses a where a.trial_id = t.id) as runs from trials t where id = $1",
      [trialId],
    );
    expect(rows[0]).toEqual({ status: "running", runs: 0 });
  });

  it("lets no farm manager close the trial or read another farm's incomplete counts", async () => {
    const { fingerprint } = await getCloseReview(coordinator, trialId);
    for (const attacker of [managers[0], outsider, observer]) {
      await expect(getCloseReview(attacker, trialId)).rejects.toMatchObject({ code: "forbidden" });
      await expect(moveTrial(attacker, trialId, "collecting", { reviewed: fingerprint })).rejects.toMatchObject({ code: "forbidden" });
    }
    const { rows } = await inspector.query<{ status: string }>("select status from trials where id = $1", [trialId]);
    expect(rows[0].status).toBe("running");
    const { rows: reportRows } = await inspector.query("select 1 from trial_report_farms where trial_id = $1", [trialId]);
    expect(reportRows).toEqual([]);
  });

  it("analyses the declared outcome on closing, equal to lib/stats on the same rows, leaving out and listing incomplete blocks", async () => {
    const review = await getCloseReview(coordinator, trialId);
    await moveTrial(coordinator, trialId, "collecting", { reviewed: review.fingerprint });
    const analysed = await getTrial(coordinator, trialId);
    const results = analysed.results!;
    const { rows } = await inspector.query<{
      farm_id: string;
      arm: string;
      contaminated: boolean;
      wet: number;
      moisture: number;
      fresh: number;
      last_flush: number | null;
    }>(
      `select b.farm_id, a.label as arm, b.contaminated, b.wet_mass_g::float8 as wet, b.moisture::float8 as moisture,
              coalesce(sum(h.fresh_mass_g) filter (where h.flush <= 2), 0)::float8 as fresh, max(h.flush) as last_flush
       from blocks b join trial_arms a on a.id = b.trial_arm_id left join harvests h on h.block_id = b.id
       where a.trial_id = $1 group by b.id, a.label`,
      [trialId],
    );
    // Compared: not contaminated (the protocol leaves those out), weighed, and through flush 2 (no block is spent yet).
    const kept = rows
      .filter((row) => !row.contaminated && row.wet !== null && (row.last_flush ?? 0) >= 2)
      .map((row) => ({
        treatment: row.arm,
        block: row.farm_id,
        y: biologicalEfficiency({ freshG: row.fresh, wetBlockG: row.wet, moisture: row.moisture }),
      }));
    const fit = blockedAnova(kept);
    expect(results.analysis.anova!.arm.p).toBeCloseTo(fit.treatment.p, 10);
    for (const mean of fit.means) {
      expect(results.analysis.anova!.adjustedMeans.find((row) => row.treatment === mean.treatment)!.estimate).toBeCloseTo(mean.estimate, 9);
    }
    // B − A from the same arm + farm model (Tukey on its least-squares means), not a one-way Tukey on pooled blocks.
    const pairAB = fit.comparisons.find((pair) => [pair.a, pair.b].sort().join() === "A,B")!;
    const bMinusA = pairAB.a === "B" ? pairAB.difference : -pairAB.difference;
    expect(results.analysis.versusReference.find((row) => row.arm === "B")!.estimate).toBeCloseTo(bMinusA, 9);
    expect(results.analysis.versusReference.find((row) => row.arm === "B")!.pAdjusted).toBeCloseTo(pairAB.pAdjusted, 9);
    const armA = rows.filter((row) => row.arm === "A");
    const contaminatedA = armA.filter((row) => row.contaminated).length;
    expect(results.analysis.arms[0].contamination!.lower).toBeCloseTo(wilsonInterval(contaminatedA, armA.length).lower, 12);
    expect(results.analysis.farmsContributing).toBe(4);
    expect(results.analysis.farmPooling).toHaveLength(2);
    // Per-farm rows are off by default (Co-op settings): the report names no farm, not even by pseudonym. Each
    // farm's pseudonym, drawn for this trial, is kept where only that farm reads it.
    expect(results.analysis.farmPooling[0].farms).toEqual([]);
    expect(results.analysis.farmPooling[0].pooled).not.toBeNull();
    const { rows: pseudonyms } = await inspector.query<{ pseudonym: string }>(
      "select pseudonym from trial_report_farms where trial_id = $1 order by pseudonym",
      [trialId],
    );
    expect(pseudonyms.map((row) => row.pseudonym)).toEqual(["Farm A", "Farm B", "Farm C", "Farm D"]);
    expect(kept).toHaveLength(41);
    expect(results.analysis.blocksAnalysed).toBe(41);
    expect(results.deviations).toMatchObject({ blocksAssigned: 48, blocksMade: 48, blocksLeftOut: 7, farmsDropped: 0 });
    expect(results.deviations.byArm).toEqual([
      {
        label: "A",
        counts: {
          listed: 16,
          inSeasonLog: 16,
          analysed: 11,
          countedAsZero: 0,
          leftOut: { contaminated: 4, lost: 0, unfinished: 1, no_harvest: 0 },
        },
      },
      {
        label: "B",
        counts: {
          listed: 16,
          inSeasonLog: 16,
          analysed: 14,
          countedAsZero: 0,
          leftOut: { contaminated: 0, lost: 1, unfinished: 1, no_harvest: 0 },
        },
      },
      {
        label: "C",
        counts: {
          listed: 16,
          inSeasonLog: 16,
          analysed: 16,
          countedAsZero: 0,
          leftOut: { contaminated: 0, lost: 0, unfinished: 0, no_harvest: 0 },
        },
      },
    ]);
    expect(results.deviations.plan).toMatchObject({ farmsPlanned: 4, farmsTakingPart: 4, farmsContributing: 4 });
    expect(results.deviations.plan!.blocksPerArmNeeded).toBeGreaterThan(0);
    // The close is recorded with the counts the coordinator confirmed.
    const { rows: closed } = await inspector.query<{ details: { incomplete?: { leftOut: unknown } } }>(
      "select details from audit_events where action = 'trial.status_changed' and details->>'trialId' = $1 and details->>'to' = 'collecting'",
      [trialId],
    );
    expect(closed[0].details.incomplete?.leftOut).toEqual({ contaminated: 4, lost: 1, unfinished: 2, no_harvest: 0 });
    // Arms are named by their strains, the letter in brackets for the block labels.
    expect(results.analysis.answer).toMatch(/^\S.* \(arm B\) gave more than the reference, .* \(arm A\): /);
    expect(JSON.stringify(results)).not.toContain(managers[0].farmId!);
  });

  it("sends no reminder once the trial is closed", async () => {
    const { rows: before } = await inspector.query<{ n: number }>(
      "select count(*)::int as n from outgoing_mail where kind = 'trial-reminder'",
    );
    for (const manager of managers)
      await expectConflict(
        sendTrialReminder(coordinator, trialId, manager.farmId!),
        /only while a trial is running; this one is "Collecting results"/,
      );
    const { rows: after } = await inspector.query<{ n: number }>(
      "select count(*)::int as n from outgoing_mail where kind = 'trial-reminder'",
    );
    expect(after[0].n).toBe(before[0].n);
  });

  it("publishes to every member and observer by e-mail, and lets them read the results", async () => {
    await moveTrial(coordinator, trialId, "published");
    const published = await getTrial(observer, trialId);
    expect(published.status).toBe("published");
    expect(published.results?.analysis.answer).toMatch(/^Valley Wild \(arm B\) gave/);
    const { rows: people } = await inspector.query<{ email: string }>("select email from users where active");
    const mail = await caughtMail(new RegExp(`^Results of trial ${trial.code}`), people.length);
    expect(mail.flatMap((message) => message.recipients).sort()).toEqual(people.map((person) => person.email).sort());
    expect(mail[0].text).toContain(`${process.env.APP_URL}/trials/${trialId}/results`);
    await expectConflict(moveTrial(coordinator, trialId, "withdrawn"), /finished/);
  });

  it("keeps a record of the mail sent, shown on Outgoing mail to the coordinator only", async () => {
    const forCoordinator = await listOutgoingMail(coordinator);
    const results = forCoordinator.filter((record) => record.subject.startsWith(`Results of trial ${trial.code}`));
    const { rows: people } = await inspector.query<{ email: string }>("select email from users where active");
    expect(results.map((record) => record.recipient).sort()).toEqual(people.map((person) => person.email).sort());
    expect(results.every((record) => record.kind === "trial-results" && record.outcome === "sent" && record.attempts === 1)).toBe(true);
    expect(await listOutgoingMail(managers[0])).toEqual([]);
    expect(await listOutgoingMail(observer)).toEqual([]);
  });
});
