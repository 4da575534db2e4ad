import { formatDate, formatDateTime, type TimeDisplay } from "@/lib/time/display";
import { count } from "@/lib/words";

/**
 * The trial e-mails, each with a plain-text and an HTML part. Farm messages end with a link
 * to stop reminders for that farm's enrolment.
 */
export interface TrialMail {
  subject: string;
  text: string;
  html: string;
}

interface TrialFacts {
  code: string;
  title: string;
  question: string;
}

const escapeHtml = (value: string) =>
  value.replace(/&/g, "&amp;").replace(/</g, "&lt;").replace(/>/g, "&gt;").replace(/"/g, "&quot;").replace(/'/g, "&#39;");

function compose(subject: string, paragraphs: string[], action: { label: string; url: string }, optOutUrl?: string): TrialMail {
  const footer = optOutUrl ? `To stop reminders about this trial for your farm: ${optOutUrl}` : "";
  const text = [...paragraphs, `${action.label}: ${action.url}`, "", "— Rhizomorph, for the co-op", footer]
    .filter((line, index, all) => line || index < all.length - 1)
    .join("\n\n")
    .trim();
  const html = `<!doctype html><html><body style="font-family:sans-serif;color:#1f2a1f;line-height:1.5">
${paragraphs.map((paragraph) => `<p>${escapeHtml(paragraph)}</p>`).join("\n")}
<p><a href="${escapeHtml(action.url)}" style="display:inline-block;padding:10px 16px;background:#3f6b3a;color:#fff;border-radius:8px;text-decoration:none">${escapeHtml(action.label)}</a></p>
<p style="color:#555">— Rhizomorph, for the co-op</p>
${optOutUrl ? `<p style="font-size:13px;color:#555"><a href="${escapeHtml(optOutUrl)}">Stop reminders about this trial for your farm</a></p>` : ""}
</body></html>`;
  return { subject, text, html };
}

/**
 * "10/12/2026 (answers are taken until 11/12/2026 01:00 CET)": the deadline day in the reader's
 * date style, and the moment it ends (the end of that day in UTC, as the app checks it) in their zone.
 */
function answerBy(deadline: { date: string; display: TimeDisplay }): string {
  const ends = new Date(`${deadline.date}T00:00:00Z`);
  ends.setUTCDate(ends.getUTCDate() + 1);
  return `${formatDate(deadline.date, deadline.display.dateStyle)} (answers are taken until ${formatDateTime(ends, deadline.display)})`;
}

export function trialInvitationMail(input: {
  trial: TrialFacts;
  farmName: string;
  /** The last day answers are taken (YYYY-MM-DD; the app takes them until that day ends in UTC), and how the reader reads dates. */
  deadline: { date: string; display: TimeDisplay } | null;
  /** What the design asks of each farm (its sample size), when the design says; and how many arms there are. */
  blocksPerArmWanted: number | null;
  arms: number;
  enrolUrl: string;
  optOutUrl: string;
}): TrialMail {
  const wanted = input.blocksPerArmWanted;
  return compose(
    `Invitation to trial ${input.trial.code}: ${input.trial.title}`,
    [
      `The co-op invites ${input.farmName} to take part in trial ${input.trial.code}, "${input.trial.title}".`,
      `The question: ${input.trial.question}`,
      ...(wanted
        ? [`The trial asks each farm for ${count(wanted, "block")} per arm: ${input.arms} arms, so ${wanted * input.arms} blocks in all.`]
        : []),
      input.deadline
        ? `Please answer by ${answerBy(input.deadline)}: accept and say how many blocks per arm you can run, or decline.`
        : "Please accept and say how many blocks per arm you can run, or decline.",
    ],
    { label: "Read the protocol and answer", url: input.enrolUrl },
    input.optOutUrl,
  );
}

export function enrolmentConfirmationMail(input: {
  trial: TrialFacts;
  farmName: string;
  blocksPerArm: number;
  arms: number;
  listUrl: string;
  optOutUrl: string;
}): TrialMail {
  const total = input.blocksPerArm * input.arms;
  return compose(
    `${input.farmName} is enrolled in trial ${input.trial.code}`,
    [
      `${input.farmName} is enrolled in trial ${input.trial.code}, "${input.trial.title}", with ${count(input.blocksPerArm, "block")} per arm (${count(total, "block")} in all).`,
      "Your randomised list of block codes is ready. Print the label sheet, tape each label onto its bag, and use the block codes in your season log so the blocks attach to the trial.",
    ],
    { label: "Open your list and label sheet", url: input.listUrl },
    input.optOutUrl,
  );
}

export function trialReminderMail(input: {
  trial: Pick<TrialFacts, "code" | "title">;
  farmName: string;
  due: string[];
  progressUrl: string;
  optOutUrl: string;
}): TrialMail {
  return compose(
    `Reminder: trial ${input.trial.code} is waiting for ${input.farmName}'s records`,
    [
      `The co-op's trial ${input.trial.code}, "${input.trial.title}", is still waiting for records from ${input.farmName}.`,
      ...(input.due.length ? [`Still due: ${input.due.join("; ")}.`] : []),
      "Upload your season log with the trial's block codes when you can.",
    ],
    { label: "See what is still due", url: input.progressUrl },
    input.optOutUrl,
  );
}

export function resultsPublishedMail(input: { trial: TrialFacts; answer: string; resultsUrl: string }): TrialMail {
  return compose(
    `Results of trial ${input.trial.code}: ${input.trial.title}`,
    [`The results of trial ${input.trial.code}, "${input.trial.title}", are published.`, input.answer],
    { label: "Read the results", url: input.resultsUrl },
  );
}

/** To everyone who was told of the results: the published results changed, why, and what they now say. */
export function resultsAmendedMail(input: {
  trial: TrialFacts;
  version: number;
  reason: string;
  answer: string;
  resultsUrl: string;
}): TrialMail {
  return compose(
    `Amended results of trial ${input.trial.code}: ${input.trial.title}`,
    [
      `The published results of trial ${input.trial.code}, "${input.trial.title}", are amended (version ${input.version}). Why: ${input.reason}`,
      input.answer,
      "The earlier version stays readable below the amendment.",
    ],
    { label: "Read the amended results", url: input.resultsUrl },
  );
}
