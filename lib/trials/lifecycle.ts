import type { MemberRole } from "../auth/permissions";

/**
 * A trial's lifecycle. Only the coordinator moves a trial, one step at a time; Withdrawn
 * ends a trial that will not be finished, from any state before Published.
 */
export const trialStatuses = ["draft", "open", "running", "collecting", "published", "withdrawn"] as const;
export type TrialStatus = (typeof trialStatuses)[number];

export const trialStatusLabels: Record<TrialStatus, string> = {
  draft: "Draft",
  open: "Open for enrolment",
  running: "Running",
  collecting: "Collecting results",
  published: "Published",
  withdrawn: "Withdrawn",
};

/** What the coordinator's button says for each move. */
export const moveLabels: Record<TrialStatus, string> = {
  draft: "Back to draft",
  open: "Open for enrolment",
  running: "Start the trial",
  collecting: "Close and analyse",
  published: "Publish the results",
  withdrawn: "Withdraw the trial",
};

const allowedMoves: Record<TrialStatus, readonly TrialStatus[]> = {
  draft: ["open", "withdrawn"],
  open: ["running", "withdrawn"],
  running: ["collecting", "withdrawn"],
  collecting: ["published", "withdrawn"],
  published: [],
  withdrawn: [],
};

export function nextStatuses(from: TrialStatus): readonly TrialStatus[] {
  return allowedMoves[from];
}

export function canMove(from: TrialStatus, to: TrialStatus): boolean {
  return allowedMoves[from].includes(to);
}

export class TrialRuleError extends Error {
  constructor(message: string) {
    super(message);
    this.name = "TrialRuleError";
  }
}

/** Throws with a message that says which moves are possible when `to` is not one of them. */
export function assertMove(from: TrialStatus, to: TrialStatus): void {
  if (canMove(from, to)) return;
  const possible = allowedMoves[from].map((status) => `"${trialStatusLabels[status]}"`);
  throw new TrialRuleError(
    possible.length
      ? `A trial that is "${trialStatusLabels[from]}" cannot move to "${trialStatusLabels[to]}"; it can move to ${possible.join(" or ")}.`
      : `A trial that is "${trialStatusLabels[from]}" is finished and cannot move any more.`,
  );
}

/** Which states let farms see what, and let the design change. */
export const isDesignEditable = (status: TrialStatus) => status === "draft";
export const isEnrolmentOpen = (status: TrialStatus) => status === "open";
export const isVisibleToMembers = (status: TrialStatus) => status !== "draft";
/** A draft is the coordinator's working copy: nobody else sees it, in the list or by its address. */
export const canSeeTrial = (role: MemberRole, status: TrialStatus) => role === "coordinator" || isVisibleToMembers(status);
export const hasResults = (status: TrialStatus) => status === "collecting" || status === "published";

/**
 * Reminders go out only while a trial runs. Once it is closed (collecting results, published or
 * withdrawn) nothing is due any more, so no reminder is sent, by the coordinator's button or by a job.
 */
export const remindersRun = (status: TrialStatus) => status === "running";

/** Why enrolment cannot open yet, in words the coordinator can act on; null when it can. */
export function openingProblem(arms: readonly { isReference: boolean }[]): string | null {
  if (arms.length < 2) return "A trial needs at least 2 arms before enrolment opens. Add an arm to the design.";
  if (arms.filter((arm) => arm.isReference).length !== 1) return "Mark exactly one arm as the reference before enrolment opens.";
  return null;
}

/**
 * Why the trial cannot start yet; null when it can. Below the co-op's minimum number of farms the
 * report could show nothing, or one farm's own figures: refused before any block is made.
 */
export function startingProblem(acceptedFarms: number, minimumFarms: number): string | null {
  if (acceptedFarms === 0) return "No farm has accepted yet. Invite farms and wait for at least one to accept before starting.";
  if (acceptedFarms < minimumFarms)
    return `Only ${acceptedFarms} farm${acceptedFarms === 1 ? " has" : "s have"} accepted. A trial starts with at least ${minimumFarms} farms, the co-op's minimum, so that its report never shows one farm's figures. Invite more farms, or wait for them to accept.`;
  return null;
}

/** Why nothing can be published yet; null when a run of the analysis exists to publish. */
export function publishingProblem(runs: number): string | null {
  return runs === 0 ? "The trial has no analysis yet; move it to Collecting results first." : null;
}
