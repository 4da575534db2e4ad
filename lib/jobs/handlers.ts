import "server-only";
import { sendQueuedMail, type Attempt } from "@/lib/data/mail";
import { issuePasswordReset } from "@/lib/data/members";
import { refreshPooledStatistics } from "@/lib/data/pooled-refresh";
import { cutReleaseIfDue } from "@/lib/data/pooled-releases";
import { sweepTrialReminders } from "@/lib/data/trial-timeline";
import { purgeRejectedUploadFiles } from "@/lib/data/upload-limits";
import type { JobName, JobPayload } from "./definitions";

/** Which attempt this is: the first has retryCount 0, and no retry follows the one where it equals retryLimit. */
export type { Attempt };

export type JobHandler<Name extends JobName> = (payload: JobPayload<Name>, attempt: Attempt) => Promise<void>;

/**
 * What each job does: one handler per name in lib/jobs/definitions.ts (the compiler insists). A
 * handler gets the payload already checked against the job's schema; throwing fails the attempt
 * and pg-boss retries it as the definition says. A handler may run more than once for one job
 * (its process died mid-way, or a retry after a half-done attempt), so make it safe to repeat.
 */
export const jobHandlers: { [Name in JobName]: JobHandler<Name> } = {
  "pooled-refresh": ({ farmId }) => refreshPooledStatistics(farmId, { onlyIfPending: true }),
  "send-mail": (mail, attempt) => sendQueuedMail(mail, attempt),
  "pooled-release": async () => {
    await cutReleaseIfDue();
  },
  "rejected-upload-files": async () => {
    await purgeRejectedUploadFiles();
  },
  "trial-reminders": async () => {
    await sweepTrialReminders();
  },
  "password-reset": (request) => issuePasswordReset(request),
};
