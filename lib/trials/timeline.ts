import { count } from "@/lib/words";
/**
 * A trial's timeline: when blocks are inoculated, when fruiting is expected, when the data are
 * due. Farms are followed against it, and only against it: a farm is behind when a date has
 * passed without what it asks for, never merely because the trial started. Dates are calendar
 * days written YYYY-MM-DD (UTC), both ends of a window included.
 */

export interface TrialTimeline {
  inoculationFrom: string | null;
  inoculationTo: string | null;
  fruitingFrom: string | null;
  fruitingTo: string | null;
  dataDue: string | null;
}

/** A farm's progress in counts: how many blocks, never how much they weighed. */
export interface TimelineProgress {
  blocksListed: number;
  blocksMade: number;
  fruiting: number;
  contaminated: number;
  /** Blocks with flush n recorded, for n = 1..k of the outcome. */
  flushesRecorded: number[];
}

/**
 * The co-op's allowances (common practice, not a standard): a first flush may come a fortnight
 * after fruiting was expected to start; the reminder before the due date goes a week ahead; a farm
 * that stays behind hears again after a week, not every day.
 */
export const timelineAllowances = { harvestGraceDays: 14, reminderLeadDays: 7, remindAgainAfterDays: 7 } as const;

const dayMs = 24 * 60 * 60 * 1000;
const isoDate = /^\d{4}-\d{2}-\d{2}$/;

function dayNumber(iso: string): number {
  if (!isoDate.test(iso)) throw new Error(`Not a date: ${iso}`);
  return Date.UTC(Number(iso.slice(0, 4)), Number(iso.slice(5, 7)) - 1, Number(iso.slice(8, 10))) / dayMs;
}

export function addDays(iso: string, days: number): string {
  return new Date((dayNumber(iso) + days) * dayMs).toISOString().slice(0, 10);
}

/** Days from `from` to `to`: positive when `to` is later. */
export function daysBetween(from: string, to: string): number {
  return dayNumber(to) - dayNumber(from);
}

export interface TimelineProblem {
  field: keyof TrialTimeline;
  message: string;
}

/** What is wrong with a timeline, in words the coordinator can act on; empty when it is in order. */
export function timelineProblems(timeline: TrialTimeline): TimelineProblem[] {
  const problems: TimelineProblem[] = [];
  const pair = (from: keyof TrialTimeline, to: keyof TrialTimeline, name: string) => {
    const start = timeline[from];
    const end = timeline[to];
    if (Boolean(start) !== Boolean(end))
      problems.push({ field: start ? to : from, message: `Give both the first and the last day of the ${name}, or leave both empty.` });
    else if (start && end && start > end)
      problems.push({
        field: to,
        message: `The ${name} ends (${end}) before it starts (${start}): the last day must be on or after the first.`,
      });
  };
  pair("inoculationFrom", "inoculationTo", "inoculation window");
  pair("fruitingFrom", "fruitingTo", "fruiting window");
  const { inoculationFrom, fruitingFrom, dataDue } = timeline;
  if (inoculationFrom && fruitingFrom && fruitingFrom < inoculationFrom)
    problems.push({
      field: "fruitingFrom",
      message: `Fruiting cannot be expected (from ${fruitingFrom}) before the first block is inoculated (${inoculationFrom}). Move the fruiting window later.`,
    });
  if (dataDue && fruitingFrom && dataDue <= fruitingFrom)
    problems.push({
      field: "dataDue",
      message: `The data are due (${dataDue}) before fruiting starts (${fruitingFrom}): the due date must come after the fruiting window opens.`,
    });
  if (dataDue && !fruitingFrom && inoculationFrom && dataDue <= inoculationFrom)
    problems.push({ field: "dataDue", message: `The data are due (${dataDue}) before inoculation starts (${inoculationFrom}).` });
  return problems;
}

export const hasTimeline = (timeline: TrialTimeline) => Object.values(timeline).some(Boolean);

/** What is still missing from a farm's records, whatever the date. */
export function missingData(progress: TimelineProgress): string[] {
  const due: string[] = [];
  if (progress.blocksMade < progress.blocksListed)
    due.push(`${progress.blocksListed - progress.blocksMade} listed blocks not yet in the season log`);
  const live = progress.blocksMade - progress.contaminated;
  progress.flushesRecorded.forEach((recorded, index) => {
    if (recorded < live) due.push(`flush ${index + 1} of ${count(live - recorded, "block")}`);
  });
  return due;
}

/**
 * Why a farm is behind today, against the timeline; empty when it is not. Three checks: blocks
 * still missing once the inoculation window has closed; no harvest at all once fruiting has been
 * expected for the grace period; anything missing once the due date has passed.
 */
export function behindReasons(timeline: TrialTimeline, progress: TimelineProgress, today: string): string[] {
  const reasons: string[] = [];
  const { inoculationTo, fruitingFrom, dataDue } = timeline;
  if (dataDue && today > dataDue) {
    const missing = missingData(progress);
    if (missing.length) return [`the data were due on ${dataDue} and are still missing: ${missing.join("; ")}`];
  }
  if (inoculationTo && today > inoculationTo && progress.blocksMade < progress.blocksListed)
    reasons.push(
      `${progress.blocksListed - progress.blocksMade} listed blocks are not in the season log, and the inoculation window closed on ${inoculationTo}`,
    );
  const live = progress.blocksMade - progress.contaminated;
  const grace = timelineAllowances.harvestGraceDays;
  if (fruitingFrom && live > 0 && progress.fruiting === 0 && daysBetween(fruitingFrom, today) > grace)
    reasons.push(`no harvest is recorded yet, more than ${grace} days after fruiting was expected to start (${fruitingFrom})`);
  return reasons;
}

export type ReminderKind = "before-due" | "behind";

/**
 * Whether the daily sweep reminds a farm today, and of what: a farm behind hears why (again only
 * after a week); a farm that is not behind but still has data missing hears once in the week
 * before the due date. Nothing when neither applies, or when it was reminded too recently.
 */
export function reminderToSend(
  timeline: TrialTimeline,
  progress: TimelineProgress,
  today: string,
  lastRemindedOn: string | null,
): { kind: ReminderKind; items: string[] } | null {
  if (lastRemindedOn && lastRemindedOn >= today) return null;
  const behind = behindReasons(timeline, progress, today);
  if (behind.length) {
    if (lastRemindedOn && daysBetween(lastRemindedOn, today) < timelineAllowances.remindAgainAfterDays) return null;
    return { kind: "behind", items: behind };
  }
  const { dataDue } = timeline;
  if (!dataDue || today >= dataDue) return null;
  const windowOpens = addDays(dataDue, -timelineAllowances.reminderLeadDays);
  if (today < windowOpens || (lastRemindedOn && lastRemindedOn >= windowOpens)) return null;
  const missing = missingData(progress);
  return missing.length ? { kind: "before-due", items: missing } : null;
}

export interface TimelineBar {
  /** The first and last day the bar spans (the today mark may fall outside). */
  start: string;
  end: string;
  periods: { key: "inoculation" | "fruiting"; label: string; from: string; to: string; left: number; width: number }[];
  /** Where the due date sits, as a percentage of the bar's width. */
  due: { date: string; at: number } | null;
  today: { date: string; at: number; within: boolean };
}

/** The timeline as a horizontal bar: each period's place and width in percent, the due date and today marked. */
export function timelineBar(timeline: TrialTimeline, today: string): TimelineBar | null {
  const dates = Object.values(timeline).filter((date): date is string => Boolean(date));
  if (!dates.length) return null;
  const start = dates.reduce((a, b) => (a < b ? a : b));
  const end = dates.reduce((a, b) => (a > b ? a : b));
  // One day more than the span, so a one-day period still shows and the last day has its width.
  const span = daysBetween(start, end) + 1;
  const at = (date: string) => Math.round((daysBetween(start, date) / span) * 1000) / 10;
  const periods: TimelineBar["periods"] = [];
  if (timeline.inoculationFrom && timeline.inoculationTo)
    periods.push({
      key: "inoculation",
      label: "Inoculation",
      from: timeline.inoculationFrom,
      to: timeline.inoculationTo,
      left: at(timeline.inoculationFrom),
      width: Math.round(((daysBetween(timeline.inoculationFrom, timeline.inoculationTo) + 1) / span) * 1000) / 10,
    });
  if (timeline.fruitingFrom && timeline.fruitingTo)
    periods.push({
      key: "fruiting",
      label: "Fruiting expected",
      from: timeline.fruitingFrom,
      to: timeline.fruitingTo,
      left: at(timeline.fruitingFrom),
      width: Math.round(((daysBetween(timeline.fruitingFrom, timeline.fruitingTo) + 1) / span) * 1000) / 10,
    });
  const within = today >= start && today <= end;
  return {
    start,
    end,
    periods,
    due: timeline.dataDue ? { date: timeline.dataDue, at: at(timeline.dataDue) } : null,
    today: { date: today, at: within ? at(today) : today < start ? 0 : 100, within },
  };
}

function relative(date: string, today: string): string {
  const days = daysBetween(today, date);
  if (days === 0) return "today";
  if (days === 1) return "tomorrow";
  if (days === -1) return "yesterday";
  return days > 0 ? `in ${days} days` : `${-days} days ago`;
}

function windowState(from: string, to: string, today: string): string {
  if (today < from) return `starts ${relative(from, today)}`;
  if (today > to) return `ended ${relative(to, today)}`;
  return `under way, ends ${relative(to, today)}`;
}

/** The same timeline in words, one line a period, for screen readers and for anyone who prefers text. */
export function timelineInWords(timeline: TrialTimeline, today: string): string[] {
  const lines: string[] = [];
  if (timeline.inoculationFrom && timeline.inoculationTo)
    lines.push(
      `Inoculation: ${timeline.inoculationFrom} to ${timeline.inoculationTo} (${windowState(timeline.inoculationFrom, timeline.inoculationTo, today)}).`,
    );
  if (timeline.fruitingFrom && timeline.fruitingTo)
    lines.push(
      `Fruiting expected: ${timeline.fruitingFrom} to ${timeline.fruitingTo} (${windowState(timeline.fruitingFrom, timeline.fruitingTo, today)}).`,
    );
  if (timeline.dataDue) lines.push(`Data due: ${timeline.dataDue} (${relative(timeline.dataDue, today)}).`);
  return lines;
}

export interface AttentionTrial {
  id: string;
  code: string;
  status: string;
  enrolmentDeadline: string | null;
  timeline: TrialTimeline;
  farms: { farmName: string; behind: string[] }[];
}

export interface AttentionItem {
  trialId: string;
  trialCode: string;
  /** When it falls; a farm behind is behind today. */
  date: string;
  text: string;
}

/**
 * The coordinator's "needs attention this week": farms behind in running trials, and the dates of
 * the next seven days (data due, a window closing or opening, an enrolment deadline), soonest first.
 */
export function attentionThisWeek(trials: AttentionTrial[], today: string): AttentionItem[] {
  const weekEnd = addDays(today, 6);
  const thisWeek = (date: string | null): date is string => Boolean(date) && date! >= today && date! <= weekEnd;
  const items: AttentionItem[] = [];
  for (const trial of trials) {
    const item = (date: string, text: string) => items.push({ trialId: trial.id, trialCode: trial.code, date, text });
    if (trial.status === "open" && thisWeek(trial.enrolmentDeadline)) item(trial.enrolmentDeadline, "Enrolment closes");
    if (trial.status !== "running") continue;
    for (const farm of trial.farms) if (farm.behind.length) item(today, `${farm.farmName} is behind: ${farm.behind.join("; ")}`);
    const { inoculationTo, fruitingFrom, dataDue } = trial.timeline;
    if (thisWeek(inoculationTo)) item(inoculationTo, "The inoculation window closes");
    if (thisWeek(fruitingFrom)) item(fruitingFrom, "Fruiting is expected to start");
    if (thisWeek(dataDue)) item(dataDue, "The data are due");
  }
  return items.sort((a, b) => a.date.localeCompare(b.date) || a.trialCode.localeCompare(b.trialCode));
}
