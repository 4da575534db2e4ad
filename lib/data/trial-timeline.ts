import "server-only";
import { asc, inArray, sql } from "drizzle-orm";
import { type Transaction } from "@/db/client";
import { trials } from "@/db/schema";
import { can } from "@/lib/auth/permissions";
import { recordAudit } from "@/lib/data/audit";
import { type Member } from "@/lib/data/members";
import { claimReminder, queueReminderMail, timelineColumns } from "@/lib/data/trials";
import { AppError } from "@/lib/errors";
import { todayUtc } from "@/lib/import/dates";
import {
  attentionThisWeek,
  behindReasons,
  missingData,
  reminderToSend,
  type AttentionItem,
  type TimelineProgress,
  type TrialTimeline,
} from "@/lib/trials/timeline";
import { asMember, asNobody } from "./context";

/** One farm taking part in a running trial, as app_trial_farm_status (0035) gives it: counts and dates, never a mass. */
export interface FarmDataStatus {
  enrolmentId: string;
  trialId: string;
  trialCode: string;
  trialTitle: string;
  timeline: TrialTimeline;
  farmId: string;
  farmName: string;
  remindersAllowed: boolean;
  progress: TimelineProgress;
  lastInoculatedOn: string | null;
  harvests: number;
  lastHarvestedOn: string | null;
  uploads: number;
  lastUploadAt: Date | null;
  lastRemindedOn: string | null;
  lastRemindedAt: Date | null;
}

type StatusRow = {
  enrolment_id: string;
  trial_id: string;
  trial_code: string;
  trial_title: string;
  inoculation_from: string | null;
  inoculation_to: string | null;
  fruiting_from: string | null;
  fruiting_to: string | null;
  data_due: string | null;
  farm_id: string;
  farm_name: string;
  reminders_allowed: boolean;
  blocks_listed: number;
  blocks_made: number;
  contaminated: number;
  fruiting: number;
  flushes: number[];
  last_inoculated_on: string | null;
  harvests: number;
  last_harvested_on: string | null;
  uploads: number;
  last_upload_at: string | Date | null;
  last_reminded_on: string | null;
  last_reminded_at: string | Date | null;
};

const asDate = (value: string | Date | null) => (value === null ? null : new Date(value));

/** Every farm in every running trial; the function answers the coordinator and the job workers only. */
async function farmDataStatus(tx: Transaction): Promise<FarmDataStatus[]> {
  const result = await tx.execute<StatusRow>(sql`select * from app_trial_farm_status()`);
  return result.rows.map((row) => ({
    enrolmentId: row.enrolment_id,
    trialId: row.trial_id,
    trialCode: row.trial_code,
    trialTitle: row.trial_title,
    timeline: {
      inoculationFrom: row.inoculation_from,
      inoculationTo: row.inoculation_to,
      fruitingFrom: row.fruiting_from,
      fruitingTo: row.fruiting_to,
      dataDue: row.data_due,
    },
    farmId: row.farm_id,
    farmName: row.farm_name,
    remindersAllowed: row.reminders_allowed,
    progress: {
      blocksListed: row.blocks_listed,
      blocksMade: row.blocks_made,
      contaminated: row.contaminated,
      fruiting: row.fruiting,
      flushesRecorded: row.flushes.map(Number),
    },
    lastInoculatedOn: row.last_inoculated_on,
    harvests: row.harvests,
    lastHarvestedOn: row.last_harvested_on,
    uploads: row.uploads,
    lastUploadAt: asDate(row.last_upload_at),
    lastRemindedOn: row.last_reminded_on,
    lastRemindedAt: asDate(row.last_reminded_at),
  }));
}

/**
 * The daily sweep (the "trial-reminders" job, as nobody): each farm of a running trial that the
 * timeline says should hear today (lib/trials/timeline.ts, reminderToSend) gets one reminder. Each
 * is claimed in its own transaction with its e-mails and audit entry, so a second sweep, at once or
 * later the same day, finds the day's reminder taken and sends nothing. Returns how many farms were reminded.
 */
export async function sweepTrialReminders(today = todayUtc()): Promise<number> {
  const farms = await asNobody(farmDataStatus);
  let reminded = 0;
  for (const farm of farms) {
    if (!farm.remindersAllowed) continue;
    const reminder = reminderToSend(farm.timeline, farm.progress, today, farm.lastRemindedOn);
    if (!reminder) continue;
    const sent = await asNobody(async (tx) => {
      const claimed = await claimReminder(tx, farm.enrolmentId, reminder.kind);
      if (!claimed) return false;
      await recordAudit(tx, {
        action: "trial.reminder_sent",
        subject: `${claimed.trialCode}: ${claimed.farmName}`,
        actorLabel: "Daily trial reminders",
        details: { trialId: claimed.trialId, farmId: farm.farmId, kind: reminder.kind },
      });
      await queueReminderMail(tx, { ...claimed, enrolmentId: farm.enrolmentId, items: reminder.items });
      return true;
    });
    if (sent) reminded += 1;
  }
  return reminded;
}

export interface CoordinatorTrialStatus {
  id: string;
  code: string;
  title: string;
  timeline: TrialTimeline;
  farms: (FarmDataStatus & { missing: string[]; behind: string[] })[];
}

export interface CoordinatorHome {
  today: string;
  running: CoordinatorTrialStatus[];
  attention: AttentionItem[];
}

/**
 * The coordinator's landing page: every running trial with each farm's data status (counts and
 * dates only), and what needs attention in the seven days from today.
 */
export async function getCoordinatorHome(member: Member, today = todayUtc()): Promise<CoordinatorHome> {
  if (!can(member.role, "trial:follow-all-farms"))
    throw new AppError("forbidden", "Only the co-op's coordinator follows every farm's trials.");
  return asMember(member, async (tx) => {
    const statuses = await farmDataStatus(tx);
    const trialRows = await tx
      .select({
        id: trials.id,
        code: trials.code,
        title: trials.title,
        status: trials.status,
        enrolmentDeadline: trials.enrolmentDeadline,
        ...timelineColumns,
      })
      .from(trials)
      .where(inArray(trials.status, ["open", "running"]))
      .orderBy(asc(trials.code));
    const running = trialRows
      .filter((trial) => trial.status === "running")
      .map((trial) => {
        const timeline: TrialTimeline = {
          inoculationFrom: trial.inoculationFrom,
          inoculationTo: trial.inoculationTo,
          fruitingFrom: trial.fruitingFrom,
          fruitingTo: trial.fruitingTo,
          dataDue: trial.dataDue,
        };
        return {
          id: trial.id,
          code: trial.code,
          title: trial.title,
          timeline,
          farms: statuses
            .filter((farm) => farm.trialId === trial.id)
            .map((farm) => ({ ...farm, missing: missingData(farm.progress), behind: behindReasons(timeline, farm.progress, today) })),
        };
      });
    const attention = attentionThisWeek(
      trialRows.map((trial) => ({
        id: trial.id,
        code: trial.code,
        status: trial.status,
        enrolmentDeadline: trial.enrolmentDeadline,
        timeline: running.find((entry) => entry.id === trial.id)?.timeline ?? {
          inoculationFrom: null,
          inoculationTo: null,
          fruitingFrom: null,
          fruitingTo: null,
          dataDue: null,
        },
        farms: running.find((entry) => entry.id === trial.id)?.farms ?? [],
      })),
      today,
    );
    return { today, running, attention };
  });
}
