import { z } from "zod";
import type { cooperativeSettings } from "@/db/schema";
import { queuedMailSchema } from "@/lib/mail/queued-mail";

/**
 * Every kind of background job the app runs: its name (the pg-boss queue), what its payload must
 * look like, and how it is retried. Handlers are in lib/jobs/handlers.ts (one per name, checked
 * by the compiler); migrations create and update each queue from this list (db/job-queue.ts);
 * requests add jobs inside their own transaction with `enqueue` (lib/jobs/queue.ts).
 * Pure data: scripts and migrations import it without the data layer.
 */
export interface JobDefinition {
  /** One line for DEVELOPERS.md readers and logs. */
  does: string;
  payload: z.ZodType;
  /** Failed attempts are retried after retryDelaySeconds, doubling each time when backoff is on (with jitter). */
  retryLimit: number;
  retryDelaySeconds: number;
  backoff: boolean;
  /** An attempt still running after this long is taken as lost (its process died) and retried. */
  expireInSeconds: number;
}

export const jobs = {
  "pooled-refresh": {
    does: "recompute one farm's pooled statistics after its rows changed",
    payload: z.object({ farmId: z.uuid() }),
    retryLimit: 6,
    retryDelaySeconds: 5,
    backoff: true,
    // A farm of 50 000 blocks takes under a second, a whole co-op of 500 000 about six.
    expireInSeconds: 300,
  },
  "send-mail": {
    does: "send one e-mail and record how it went",
    payload: queuedMailSchema,
    // 30 s, 1, 2, 4 … 64 min: a mail service that is down for about two hours loses nothing.
    retryLimit: 8,
    retryDelaySeconds: 30,
    backoff: true,
    expireInSeconds: 120,
  },
  "pooled-release": {
    does: "cut a release of the pooled figures if the co-op's schedule says one is due",
    payload: z.object({}),
    retryLimit: 3,
    retryDelaySeconds: 60,
    backoff: true,
    // Cutting copies every farm's statistics: about a second for 50 farms.
    expireInSeconds: 300,
  },
  "rejected-upload-files": {
    does: "remove the stored files of rejected uploads older than the co-op's retention period (their records and reports stay)",
    payload: z.object({}),
    retryLimit: 3,
    retryDelaySeconds: 300,
    backoff: true,
    expireInSeconds: 600,
  },
  "trial-reminders": {
    does: "remind the farms of running trials that their timeline says should hear today (one a day per farm at most)",
    payload: z.object({}),
    retryLimit: 3,
    retryDelaySeconds: 300,
    backoff: true,
    expireInSeconds: 600,
  },
  "password-reset": {
    does: "look up a reset request's address and, for an active member, queue the reset e-mail",
    payload: z.object({ email: z.string().max(320), ip: z.string().max(100).nullable() }),
    retryLimit: 5,
    retryDelaySeconds: 5,
    backoff: true,
    expireInSeconds: 60,
  },
} as const satisfies Record<string, JobDefinition>;

export type JobName = keyof typeof jobs;
export type JobPayload<Name extends JobName> = z.infer<(typeof jobs)[Name]["payload"]>;
export const jobNames = Object.keys(jobs) as JobName[];

export type CooperativeSettings = typeof cooperativeSettings.$inferSelect;

/** When a scheduled job runs: a five-field cron expression, in a time zone (UTC when not given). */
export interface JobSchedule {
  cron: string;
  timezone?: string;
}

/**
 * A job that runs on a timetable the co-op sets. `when` reads the co-op's settings and returns the
 * schedule, or null for "not scheduled"; the workers apply it at start and within a minute of a
 * change to the settings (lib/jobs/worker.ts, syncSchedules). One schedule per job name.
 */
export type ScheduledJob = {
  [Name in JobName]: { job: Name; payload: JobPayload<Name>; when: (settings: CooperativeSettings) => JobSchedule | null };
}[JobName];

export const scheduledJobs: ScheduledJob[] = [
  // Every ten minutes, not at the co-op's hour itself: cutReleaseIfDue tries each slot of the
  // schedule once, so a slot that fell while no app process was up is tried when one is.
  { job: "pooled-release", payload: {}, when: (settings) => (settings.releaseSchedule === "manual" ? null : { cron: "*/10 * * * *" }) },
  // Once a night, after the release hour's usual slot; the retention period itself is read when it runs.
  { job: "rejected-upload-files", payload: {}, when: () => ({ cron: "30 3 * * *" }) },
  // Every morning (UTC), so a reminder arrives at the start of a working day in the co-op's region.
  { job: "trial-reminders", payload: {}, when: () => ({ cron: "0 7 * * *" }) },
];
