/**
 * Folds runs of the same event (same person, same change, same particulars, one right after the
 * other) into one row of the activity log: a coordinator looking for a release five times in a
 * minute, or a person signing in again and again, reads as one line that says how often.
 */
export interface LoggedEvent {
  action: string;
  subject: string;
  actorLabel: string;
  actorUserId?: string | null;
  details: Record<string, unknown>;
  ip?: string | null;
  occurredAt: Date;
}

export interface FoldedEvent<Event> {
  /** The newest event of the run (the list is newest first). */
  latest: Event;
  /** The oldest event of the run. */
  first: Event;
  times: number;
}

const sameChange = (a: LoggedEvent, b: LoggedEvent): boolean =>
  a.action === b.action &&
  a.subject === b.subject &&
  a.actorLabel === b.actorLabel &&
  (a.actorUserId ?? null) === (b.actorUserId ?? null) &&
  (a.ip ?? null) === (b.ip ?? null) &&
  JSON.stringify(a.details) === JSON.stringify(b.details);

/** Events in the order given (newest first); only neighbours fold, so the order of what happened stays as it was. */
export function foldRepeats<Event extends LoggedEvent>(events: readonly Event[]): FoldedEvent<Event>[] {
  const folded: FoldedEvent<Event>[] = [];
  for (const event of events) {
    const last = folded.at(-1);
    if (last && sameChange(last.first, event)) {
      last.first = event;
      last.times += 1;
    } else folded.push({ latest: event, first: event, times: 1 });
  }
  return folded;
}
