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
export const hasResults = (status: TrialStatus) => status === "collecting" || status === "published";

/**
 * Reminders go out only while a trial runs. Once it is closed (collecting results, published or
 * withdrawn) nothing is due any more, so no reminder is sent, by the coordinator's button or by a job.
 */
export const remindersRun = (status: TrialStatus) => status === "running";
