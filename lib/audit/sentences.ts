/**
 * The activity log in words: one sentence per event saying who did what, the particulars as
 * labelled values, and a link to what changed. Pure, so every sentence is tested without a database.
 */
import { seasonLogColumns } from "@/lib/import/schema";
import { roleLabels, type MemberRole } from "@/lib/auth/permissions";
import { releaseScheduleLabels, type ReleaseSchedule } from "@/lib/pooled/release-schedule";
import { trialStatusLabels, type TrialStatus } from "@/lib/trials/lifecycle";
import type { AuditAction } from "./actions";
import { count, listInWords } from "@/lib/words";

export interface AuditEventInput {
  action: string;
  subject: string;
  actorLabel: string;
  details: Record<string, unknown>;
  /** True on a farm's own log, whose people are managed on the farm's page rather than the co-op's. */
  onFarmLog?: boolean;
}

export interface AuditDetail {
  label: string;
  value: string;
}

export interface AuditDescription {
  sentence: string;
  details: AuditDetail[];
  link?: { href: string; label: string };
}

/** Who the log names: the person's name as it was then, or that nobody was signed in. */
export function whoOf(actorLabel: string): string {
  return actorLabel.trim() || "Someone not signed in";
}

const number = (value: unknown): number => (typeof value === "number" && Number.isFinite(value) ? value : 0);
const text = (value: unknown): string =>
  typeof value === "string" ? value : typeof value === "number" || typeof value === "boolean" ? String(value) : "";
const record = (value: unknown): Record<string, unknown> =>
  value !== null && typeof value === "object" && !Array.isArray(value) ? (value as Record<string, unknown>) : {};
const day = (value: unknown): string => text(value).slice(0, 10);
const yesNo = (value: unknown): string => (value ? "Yes" : "No");

const roleWords = (role: unknown): string => (roleLabels[role as MemberRole] ?? text(role)).toLowerCase();
const aRole = (role: unknown): string => {
  const words = roleWords(role);
  return `${/^[aeiou]/.test(words) ? "an" : "a"} ${words}`;
};
const statusWords = (status: unknown): string => trialStatusLabels[status as TrialStatus] ?? text(status);

const fieldTitles = new Map<string, string>(seasonLogColumns.map((column) => [column.name, column.title]));
const massFields = new Set(["block_wet_weight", "fresh_weight", "dry_weight", "spent_weight"]);
const fieldTitle = (field: string): string => fieldTitles.get(field) ?? field.replace(/_/g, " ");
const shownValue = (field: string, value: unknown): string =>
  value === null || value === undefined || value === "" ? "(blank)" : massFields.has(field) ? `${text(value)} g` : text(value);

/** The warnings a person saw and saved anyway, as the check words them in short. */
const warningWords: Record<string, string> = {
  flush_heavier_than_block: "a flush heavier than the block",
  efficiency_implausible: "an unusual biological efficiency",
  dry_weight_implausible: "an unusual dry weight",
  flush_gap: "a gap in the flush numbers",
  harvest_on_contaminated_block: "a harvest from a contaminated block",
  harvest_before_inoculation: "a harvest before inoculation",
  contamination_date_not_contaminated: "a contamination day on a clean block",
};
function savedAnyway(details: Record<string, unknown>): AuditDetail[] {
  const codes = Array.isArray(details.savedAnyway) ? details.savedAnyway.map(text) : [];
  if (codes.length === 0) return [];
  return [
    { label: "Saved despite a warning about", value: listInWords(codes.map((code) => warningWords[code] ?? code.replace(/_/g, " "))) },
  ];
}

/** Each value an edit replaced: "Fresh weight of flush 2: 1200 g → 1250 g". */
function changedValues(details: Record<string, unknown>): AuditDetail[] {
  const changes = Array.isArray(details.changes) ? details.changes.map(record) : [];
  return changes.map((change) => {
    const field = text(change.field);
    const flush = change.flush === null || change.flush === undefined ? "" : ` of flush ${text(change.flush)}`;
    return {
      label: `${fieldTitle(field)}${flush}`,
      value: `${shownValue(field, change.oldValue)} → ${shownValue(field, change.newValue)}`,
    };
  });
}

const reason = (details: Record<string, unknown>): AuditDetail[] =>
  text(details.reason).trim() ? [{ label: "Reason", value: text(details.reason).trim() }] : [];

const blockLink = (details: Record<string, unknown>, code: string) =>
  text(details.blockId) ? { href: `/blocks/${text(details.blockId)}`, label: `Block ${code}` } : undefined;
const roomLink = (details: Record<string, unknown>, name: string) =>
  text(details.roomId) ? { href: `/rooms/${text(details.roomId)}`, label: `Room ${name}` } : undefined;
const uploadLink = (details: Record<string, unknown>, fileName: string) =>
  text(details.uploadId) ? { href: `/api/season-logs/${text(details.uploadId)}/file`, label: `Download ${fileName}` } : undefined;
const trialLink = (details: Record<string, unknown>, code: string) =>
  text(details.trialId) ? { href: `/trials/${text(details.trialId)}`, label: `Trial ${code}` } : undefined;

/** "B-014 flush 2" → the block's code; subjects of harvest events name the block and flush. */
const blockCodeOf = (subject: string): string => subject.replace(/ flush \d+$/, "");
/** "OY-2026: run 2" or "OY-2026: Alder Farm" → ["OY-2026", "run 2"]. */
function splitSubject(subject: string): [string, string] {
  const at = subject.indexOf(": ");
  return at < 0 ? [subject, ""] : [subject.slice(0, at), subject.slice(at + 2)];
}

const settingTitles: Record<string, { title: string; shown?: (value: unknown) => string }> = {
  minimumFarms: { title: "Minimum farms for a pooled figure" },
  showPerFarmEstimates: { title: "Show anonymised per-farm estimates", shown: yesNo },
  releaseSchedule: {
    title: "When releases are published",
    shown: (value) => releaseScheduleLabels[value as ReleaseSchedule] ?? text(value),
  },
  releaseHour: { title: "Hour releases are cut", shown: (value) => `${text(value)}:00` },
  releaseTimeZone: { title: "On the clocks of", shown: (value) => text(value) },
  rejectedUploadRetentionDays: { title: "Days a rejected upload's file is kept" },
};

const registryWords: Record<string, string> = {
  species: "species list",
  strains: "strain list",
  substrate_recipes: "substrate recipe list",
  treatments: "treatment list",
};

const incompleteTitles: Record<string, string> = {
  listed: "Blocks on the farms' lists",
  notInSeasonLog: "Listed blocks not in a season log",
  withoutOutcomeFlushes: "Blocks not through the outcome's flushes",
  withoutMass: "Blocks without a wet weight or moisture",
  notSpent: "Blocks without a spent weight",
  contaminated: "Contaminated blocks",
  wouldCount: "Blocks compared",
};

const listOf = (details: Record<string, unknown>): string => registryWords[text(details.registry)] ?? "registers";
const registryMove = (sentence: string): AuditDescription => ({ sentence, details: [], link: { href: "/strains", label: "Strains" } });

type Describe = (who: string, subject: string, details: Record<string, unknown>, onFarmLog: boolean) => AuditDescription;

const peopleLink = (onFarmLog: boolean) =>
  onFarmLog ? { href: "/farm-people", label: "Farm people" } : { href: "/members", label: "Members" };

/** What each action means; the type makes a missing one a compile error, and the unit test a failing test. */
export const auditSentences: Record<AuditAction, Describe> = {
  "sign-in": (who, subject) => ({ sentence: `${who} signed in.`, details: [{ label: "Address", value: subject }] }),
  "sign-in.failed": (_who, subject) => ({
    sentence: `A sign-in as ${subject} was refused: a wrong address or password, or an account that is not active.`,
    details: [],
  }),
  "sign-in.rate-limited": (_who, subject, details) => ({
    sentence: `Sign-ins as ${subject} were paused after too many failed tries.`,
    details: [{ label: "Next try allowed after", value: count(number(details.waitSeconds), "second") }],
  }),
  "sessions.ended-everywhere": (who) => ({ sentence: `${who} signed out on every device.`, details: [] }),
  "password.changed": (who) => ({ sentence: `${who} changed their password.`, details: [] }),
  "password.reset-requested": (_who, subject, details) => ({
    sentence: `A password reset link was asked for ${subject}.`,
    details: [{ label: "The address belongs to a member", value: yesNo(details.known) }],
  }),
  "password.reset": (who, subject) => ({
    sentence: `${who} set a new password with a reset link.`,
    details: [{ label: "Address", value: subject }],
  }),
  "preferences.changed": (who, _subject, details) => ({
    sentence: `${who} changed their settings.`,
    details: [
      { label: "Units shown", value: details.displayUnits === "imperial" ? "Pounds and ounces" : "Grams and kilograms" },
      { label: "Trial reminders by e-mail", value: yesNo(details.notifyReminders) },
    ],
  }),

  "member.invited": (who, subject, details, onFarmLog) => ({
    sentence: `${who} invited ${subject} to join as ${aRole(details.role)}.`,
    details: [{ label: "The link expires on", value: day(details.expiresAt) }],
    link: peopleLink(onFarmLog),
  }),
  "member.invitation-resent": (who, subject, details, onFarmLog) => ({
    sentence: `${who} sent ${subject} a new invitation link.`,
    details: [
      { label: "Role", value: roleWords(details.role) },
      { label: "The link expires on", value: day(details.expiresAt) },
    ],
    link: peopleLink(onFarmLog),
  }),
  "member.invitation-cancelled": (who, subject, details, onFarmLog) => ({
    sentence: `${who} cancelled the invitation to ${subject}.`,
    details: [{ label: "Role", value: roleWords(details.role) }],
    link: peopleLink(onFarmLog),
  }),
  "member.joined": (who, subject, details, onFarmLog) => ({
    sentence: `${who} accepted the invitation and joined as ${aRole(details.role)}.`,
    details: [{ label: "Address", value: subject }],
    link: peopleLink(onFarmLog),
  }),
  "member.role-changed": (who, subject, details, onFarmLog) => ({
    sentence: `${who} changed ${subject}'s role from ${roleWords(details.oldRole)} to ${roleWords(details.newRole)}.`,
    details: [],
    link: peopleLink(onFarmLog),
  }),
  "member.deactivated": (who, subject, details, onFarmLog) => ({
    sentence: `${who} deactivated ${subject}, who can no longer sign in.`,
    details: [{ label: "Role", value: roleWords(details.role) }],
    link: peopleLink(onFarmLog),
  }),
  "member.manager-transferred": (who, subject, _details, onFarmLog) => ({
    sentence: `${who} handed the farm manager role to ${subject} and became a grower.`,
    details: [],
    link: peopleLink(onFarmLog),
  }),

  "farm.admitted": (who, subject, details) => ({
    sentence: `${who} admitted ${subject} to the co-op.`,
    details: text(details.region) ? [{ label: "Region", value: text(details.region) }] : [],
    link: { href: "/members", label: "Members" },
  }),
  "farm.suspended": (who, subject) => ({
    sentence: `${who} suspended ${subject}: its people cannot sign in until it is reinstated.`,
    details: [],
  }),
  "farm.removed": (who, subject) => ({ sentence: `${who} removed ${subject} from the co-op.`, details: [] }),
  "farm.reinstated": (who, subject) => ({ sentence: `${who} reinstated ${subject}.`, details: [] }),
  "farm.data-exported": (who, subject, details) => ({
    sentence: `${who} downloaded all of ${subject}'s records: ${listInWords([
      count(number(details.blocks), "block"),
      count(number(details.harvests), "harvest"),
      count(number(details.uploads), "upload"),
    ])}.`,
    details: [],
  }),
  "farm.withdrew-data": (who, subject, details) => ({
    sentence: `${who} withdrew ${subject}'s records from the co-op: ${listInWords([
      count(number(details.blocks), "block"),
      count(number(details.harvests), "harvest"),
      count(number(details.uploads), "upload"),
    ])} deleted.`,
    details: [
      { label: "Recorded changes deleted", value: String(number(details.valueChanges)) },
      { label: "Trial enrolments dropped", value: String(number(details.trialEnrolmentsDropped)) },
      { label: "Published trials noting the withdrawal", value: String(number(details.publishedTrialsNoted)) },
    ],
  }),

  "cooperative-settings.updated": (who, _subject, details) => {
    const before = record(details.before);
    const after = record(details.after);
    const changed = Object.keys(after)
      .filter((key) => JSON.stringify(before[key]) !== JSON.stringify(after[key]))
      .map((key) => {
        const setting = settingTitles[key] ?? { title: key };
        const shown = setting.shown ?? text;
        return { label: setting.title, value: `${shown(before[key])} → ${shown(after[key])}` };
      });
    const what = changed.map((change) => `${change.label.toLowerCase()} ${change.value}`);
    return {
      sentence: changed.length ? `${who} changed the co-op settings: ${listInWords(what)}.` : `${who} saved the co-op settings unchanged.`,
      details: changed,
      link: { href: "/settings/cooperative", label: "Co-op settings" },
    };
  },
  "registry.imported": (who, subject, details) => ({
    sentence: `${who} imported the ${registryWords[subject] ?? subject}: ${count(number(details.rows), "row")}.`,
    details: [],
    link: { href: "/strains", label: "Strains" },
  }),
  "registry.added": (who, subject, details) => registryMove(`${who} added ${subject} to the ${listOf(details)}.`),
  "registry.proposed": (who, subject, details) =>
    registryMove(`${who} proposed ${subject} for the ${listOf(details)}; it waits for the coordinator's approval.`),
  "registry.approved": (who, subject, details) => registryMove(`${who} approved ${subject} for the ${listOf(details)}.`),
  "registry.retired": (who, subject, details) =>
    registryMove(`${who} retired ${subject} from the ${listOf(details)}: past records keep it, new ones cannot use it.`),
  "registry.reinstated": (who, subject, details) => registryMove(`${who} reinstated ${subject} in the ${listOf(details)}.`),
  "registry.deleted": (who, subject, details) => registryMove(`${who} deleted ${subject} from the ${listOf(details)}.`),
  "pooled-release.cut": (who, _subject, details) => ({
    sentence: `${who} published release ${number(details.release)} of the co-op results: ${count(number(details.figuresChanged), "figure")} changed.`,
    details: [],
    link: { href: "/results", label: "Co-op results" },
  }),
  "pooled-release.checked": (who, _subject, details) => ({
    sentence: `${who} looked for a new release of the co-op results: ${
      details.outcome === "waiting" ? "the changes wait for more farms" : "nothing had changed"
    }.`,
    details: [],
    link: { href: "/results", label: "Co-op results" },
  }),

  "harvest.recorded": (who, subject, details) => {
    const code = blockCodeOf(subject);
    return {
      sentence: `${who} recorded flush ${number(details.flush)} of block ${code} on the phone form: ${number(details.freshGrams)} g fresh.`,
      details: savedAnyway(details),
      link: blockLink(details, code),
    };
  },
  "harvest.corrected": (who, subject, details) => {
    const code = blockCodeOf(subject);
    const changes = changedValues(details);
    return {
      sentence: `${who} corrected flush ${number(details.flush)} of block ${code}: ${count(changes.length, "value")} changed.`,
      details: [...changes, ...reason(details), ...savedAnyway(details)],
      link: blockLink(details, code),
    };
  },
  "harvest.deleted": (who, subject, details) => {
    const code = blockCodeOf(subject);
    return {
      sentence: `${who} deleted flush ${number(details.flush)} of block ${code}.`,
      details: [...changedValues(details), ...reason(details)],
      link: blockLink(details, code),
    };
  },
  "block.corrected": (who, subject, details) => {
    const changes = changedValues(details);
    return {
      sentence: `${who} corrected block ${subject}: ${count(changes.length, "value")} changed.`,
      details: [...changes, ...reason(details), ...savedAnyway(details)],
      link: blockLink(details, subject),
    };
  },
  "block.moved": (who, subject, details) => ({
    sentence: text(details.movedOn)
      ? `${who} recorded block ${subject} moved to ${text(details.roomName) || "a room"} on ${day(details.movedOn)}.`
      : `${who} recorded block ${subject} in ${text(details.roomName) || "a room"} from the start of fruiting.`,
    details: text(details.from)
      ? [{ label: "Recorded on", value: text(details.from) === "harvest" ? "the phone harvest form" : text(details.from) }]
      : [],
    link: blockLink(details, subject),
  }),
  "room.added": (who, subject, details) => ({
    sentence: `${who} added the fruiting room ${subject}.`,
    details: [],
    link: roomLink(details, subject),
  }),
  "room.changed": (who, subject, details) => {
    const changes = Array.isArray(details.changes) ? details.changes.map(record) : [];
    return {
      sentence: `${who} changed the fruiting room ${subject}: ${count(changes.length, "value")} changed.`,
      details: changes.map((change) => ({
        label: text(change.label),
        value: `${text(change.oldValue) || "(blank)"} → ${text(change.newValue) || "(blank)"}`,
      })),
      link: roomLink(details, subject),
    };
  },
  "room.retired": (who, subject, details) => ({
    sentence: `${who} retired the fruiting room ${subject} from ${day(details.retiredOn)}; its history stays.`,
    details: [],
    link: roomLink(details, subject),
  }),
  "room.reinstated": (who, subject, details) => ({
    sentence: `${who} took the fruiting room ${subject} back into use.`,
    details: [],
    link: roomLink(details, subject),
  }),
  "room.regime-recorded": (who, subject, details) => ({
    sentence: `${who} recorded how ${subject} is run from ${day(details.startsOn)}: ${text(details.words) || "a new climate regime"}.`,
    details: text(details.regimeKind) ? [{ label: "Climate regime", value: text(details.regimeKind) }] : [],
    link: roomLink(details, subject),
  }),

  "season-log.uploaded": (who, subject, details) => {
    const found = [count(number(details.rows), "row"), count(number(details.errors), "error"), count(number(details.warnings), "warning")];
    return {
      sentence: details.alreadyImported
        ? `${who} uploaded the season log '${subject}' again: the same file was committed before, so it changes nothing.`
        : `${who} uploaded the season log '${subject}': ${listInWords(found)}.`,
      details: [],
      link: uploadLink(details, subject),
    };
  },
  "climate-log.uploaded": (who, subject, details) => {
    const skipped = number(details.skippedReadings);
    return {
      sentence: `${who} uploaded the climate log '${subject}' for the room '${text(details.roomName)}': ${count(number(details.readings), "reading")}${
        skipped ? `, leaving out ${count(skipped, "reading")} in times the room's earlier logs already cover` : ""
      }.`,
      details: [
        { label: "Logger layout", value: text(details.shape) },
        { label: "Logger's clock", value: text(details.timeZone) },
      ],
      link: text(details.roomId) ? { href: `/rooms/${text(details.roomId)}/climate`, label: "The room's climate" } : undefined,
    };
  },
  "season-log.committed": (who, subject, details) => {
    const parts = [
      count(number(details.newBlocks), "new block"),
      count(number(details.changedBlocks), "changed block"),
      count(number(details.newHarvests), "new harvest"),
      count(number(details.changedHarvests), "changed harvest"),
      count(number(details.removedHarvests), "harvest removed", "harvests removed"),
    ].filter((part) => !part.startsWith("0 "));
    return {
      sentence: `${who} committed the season log '${subject}': ${parts.length ? listInWords(parts) : "nothing new or changed"}.`,
      details: [
        { label: "Values replaced", value: String(number(details.changedValues)) },
        { label: "Blocks the file left as they were", value: String(number(details.untouchedBlocks)) },
        { label: "Harvests the file left as they were", value: String(number(details.untouchedHarvests)) },
      ],
      link: uploadLink(details, subject),
    };
  },
  "season-log.undone": (who, subject, details) => {
    const removed = Array.isArray(details.removedBlockCodes) ? details.removedBlockCodes.map(text) : [];
    return {
      sentence: `${who} undid the commit of '${subject}': ${listInWords([
        `${count(number(details.removedBlocks), "block")} and ${count(number(details.removedHarvests), "harvest")} removed`,
        `${count(number(details.restoredRows), "row")} put back as they were`,
      ])}.`,
      details: [
        ...reason(details),
        ...(removed.length
          ? [{ label: "Blocks removed", value: removed.length > 20 ? `${removed.slice(0, 20).join(", ")} …` : removed.join(", ") }]
          : []),
        { label: "Values put back", value: String(number(details.valuesPutBack)) },
      ],
      link: uploadLink(details, subject),
    };
  },

  "trial.created": (who, subject, details) => ({
    sentence: `${who} drafted the trial ${subject} with ${count(number(details.arms), "arm")}.`,
    details: [],
    link: trialLink(details, subject),
  }),
  "trial.draft_saved": (who, subject, details) => ({
    sentence: `${who} saved the draft of trial ${subject}: ${count(number(details.arms), "arm")}.`,
    details: [],
    link: trialLink(details, subject),
  }),
  "trial.status_changed": (who, subject, details) => {
    const incomplete = record(details.incomplete);
    const published = details.run !== undefined;
    return {
      sentence: published
        ? `${who} published the results of trial ${subject} (run ${number(details.run)}, version ${number(details.version)}).`
        : `${who} moved trial ${subject} from ${statusWords(details.from)} to ${statusWords(details.to)}.`,
      details: Object.entries(incompleteTitles)
        .filter(([key]) => typeof incomplete[key] === "number")
        .map(([key, label]) => ({ label, value: String(incomplete[key]) })),
      link: trialLink(details, subject),
    };
  },
  "trial.analysed": (who, subject, details) => {
    const [code] = splitSubject(subject);
    const inputs = record(details.inputs);
    return {
      sentence: `${who} ran the analysis of trial ${code} (run ${number(details.run)}) on ${listInWords([
        count(number(inputs.farms), "farm"),
        count(number(inputs.blocks), "block"),
      ])}.`,
      details: [
        { label: "Blocks compared", value: String(number(inputs.compared)) },
        { label: "Blocks left out", value: String(number(inputs.leftOut)) },
        { label: "Harvests read", value: String(number(inputs.harvests)) },
      ],
      link: trialLink(details, code),
    };
  },
  "trial.amended": (who, subject, details) => {
    const [code] = splitSubject(subject);
    return {
      sentence: `${who} amended the results of trial ${code}: version ${number(details.version)} shows run ${number(details.run)}.`,
      details: reason(details),
      link: trialLink(details, code),
    };
  },
  "trial.farm_invited": (who, subject, details) => {
    const [code, farm] = splitSubject(subject);
    return { sentence: `${who} invited ${farm} to trial ${code}.`, details: [], link: trialLink(details, code) };
  },
  "trial.farm_asked_to_join": (who, subject, details) => ({
    sentence: `${who} asked for ${text(details.farm) || "their farm"} to join trial ${subject}.`,
    details: [],
    link: trialLink(details, subject),
  }),
  "trial.enrolment_declined": (who, subject, details) => ({
    sentence: `${who} declined trial ${subject} for the farm.`,
    details: [],
    link: trialLink(details, subject),
  }),
  "trial.enrolment_accepted": (who, subject, details) => ({
    sentence:
      typeof details.rooms === "number"
        ? `${who} enrolled the farm in trial ${subject}: ${count(details.rooms, "fruiting room")} drawn to the arms, ${count(
            number(details.blocks),
            "block",
          )} in all.`
        : `${who} enrolled the farm in trial ${subject}: ${count(number(details.blocksPerArm), "block")} per arm, ${count(
            number(details.blocks),
            "block",
          )} in all.`,
    details: text(details.seed) ? [{ label: "Seed of the randomised list", value: text(details.seed) }] : [],
    link: trialLink(details, subject),
  }),
  "trial.reminder_sent": (who, subject, details) => {
    const [code, farm] = splitSubject(subject);
    return { sentence: `${who} reminded ${farm} by e-mail to send trial ${code}'s records.`, details: [], link: trialLink(details, code) };
  },
};

const isKnown = (action: string): action is AuditAction => Object.hasOwn(auditSentences, action);

/** One logged event in words. An action no longer recorded still reads as a plain sentence, never its internal name. */
export function describeAuditEvent(entry: AuditEventInput): AuditDescription {
  const who = whoOf(entry.actorLabel);
  if (!isKnown(entry.action)) return { sentence: `${who} made a change: ${entry.subject || "no subject recorded"}.`, details: [] };
  const described = auditSentences[entry.action](who, entry.subject, entry.details ?? {}, entry.onFarmLog ?? false);
  return described.link ? described : { sentence: described.sentence, details: described.details };
}
