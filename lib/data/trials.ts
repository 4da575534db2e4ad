import "server-only";
import { createHash, randomBytes } from "node:crypto";
import { and, asc, desc, eq, inArray, isNull, like, sql } from "drizzle-orm";
import { withAnalystAccess, type Transaction } from "@/db/client";
import {
  auditEvents,
  blockRoomMoves,
  blocks,
  fruitingRooms,
  cooperativeSettings,
  farms,
  harvests,
  species,
  strains,
  treatments,
  trialArms,
  trialBlockAssignments,
  trialEnrolments,
  trialRoomAssignments,
  trialAnalyses,
  trialPublications,
  trialReportFarms,
  trialReminders,
  trials,
  users,
} from "@/db/schema";
import { appUrl } from "@/lib/app-url";
import { can } from "@/lib/auth/permissions";
import { actor, recordAudit } from "@/lib/data/audit";
import { queueMail, secretLink } from "@/lib/data/mail";
import { type Member } from "@/lib/data/members";
import { latestRelease, releaseContents } from "@/lib/data/pooled-releases";
import { AppError } from "@/lib/errors";
import { todayUtc } from "@/lib/import/dates";
import { trialListCsv } from "@/lib/season-logs/export";
import {
  enrolmentConfirmationMail,
  resultsAmendedMail,
  resultsPublishedMail,
  trialInvitationMail,
  trialReminderMail,
  type TrialMail,
} from "@/lib/mail/messages/trials";
import type { MailKind, SecretLink } from "@/lib/mail/queued-mail";
import { pooledRoomIcc, publishedSteps, roundTo, withinFarmSpread } from "@/lib/pooled";
import { roomArmsProblems } from "@/lib/trials/room-design";
import { trialBlockRooms } from "@/lib/trials/room-analysis";
import { drawRoomsToArms, roomBlockList } from "@/lib/trials/room-draw";
import { seededRandom } from "@/lib/random";
import {
  assertMove,
  canSeeTrial,
  openingProblem,
  publishingProblem,
  startingProblem,
  blockCodePrefix,
  incompleteCounts,
  remindersRun,
  hasResults,
  isDesignEditable,
  permutedBlockList,
  TrialRuleError,
  markOwnFarm,
  trialReport,
  trialStatusLabels,
  type IncompleteCounts,
  type ListEntry,
  type StoredTrialResults,
  type TrialBlockRecord,
  type TrialStatus,
} from "@/lib/trials";
import type { TrialDesignKind } from "@/lib/trials/design-kind";
import { crossedArmsProblems } from "@/lib/trials/factorial";
import { verifyOptOutToken } from "@/lib/trials/reminder-opt-out";
import { trialSampleSize } from "@/lib/trials/sample-size";
import { behindReasons, missingData, type TimelineProgress, type TrialTimeline } from "@/lib/trials/timeline";
import { chosenDisplay, formatDate } from "@/lib/time/display";
import {
  amendmentReasonProblem,
  analysisFingerprint,
  analysisInputCounts,
  farmsChangedBetween,
  type AnalysisInputCounts,
} from "@/lib/trials/versions";
import { env } from "@/lib/env";
import { asMember, asNobody } from "./context";

export interface ArmInput {
  label: string;
  strainId: string;
  treatmentId: string | null;
  isReference: boolean;
}

export interface TrialDesignInput {
  trialId?: string;
  title: string;
  question: string;
  speciesId: string;
  /** One factor (default), or the arms cross strains with fruiting methods, one arm per combination. */
  designKind?: TrialDesignKind;
  arms: ArmInput[];
  outcomeFlushes: number;
  contaminatedHandling: "exclude" | "count_as_zero";
  protocolNotes: string;
  enrolmentDeadline: string | null;
  inoculationFrom: string | null;
  inoculationTo: string | null;
  fruitingFrom: string | null;
  fruitingTo: string | null;
  dataDue: string | null;
  smallestDifference: number | null;
  expectedSd: number | null;
  plannedFarms: number | null;
  expectedLoss: number | null;
  /** A room-level trial ("rooms"): the blocks each room holds and the intraclass correlation it was sized with. */
  blocksPerRoom?: number | null;
  roomIcc?: number | null;
}

export interface TrialArmView {
  id: string;
  label: string;
  isReference: boolean;
  strainId: string;
  strainCode: string;
  strainName: string;
  treatmentId: string | null;
  treatmentName: string | null;
  treatmentKind: string | null;
}

export type StoredResults = StoredTrialResults;

// Unsubscribe links are signed with the sessions' secret, which lib/env.ts never lets be empty.
const optOutSecret = () => env("AUTH_SECRET");

/** A trial's timeline as it is read wherever a trial is (lib/trials/timeline.ts). */
export const timelineColumns = {
  inoculationFrom: trials.inoculationFrom,
  inoculationTo: trials.inoculationTo,
  fruitingFrom: trials.fruitingFrom,
  fruitingTo: trials.fruitingTo,
  dataDue: trials.dataDue,
};

function refuseIf(problem: string | null): void {
  if (problem) throw new AppError("conflict", problem);
}

function ruleError(error: unknown): never {
  if (error instanceof TrialRuleError) throw new AppError("conflict", error.message);
  throw error;
}

// ——— Reading ———

export async function listTrials(member: Member) {
  return asMember(member, async (tx) => {
    const rows = await tx
      .select({
        id: trials.id,
        code: trials.code,
        title: trials.title,
        status: trials.status,
        speciesName: species.commonName,
        enrolmentDeadline: trials.enrolmentDeadline,
        publishedAt: trials.publishedAt,
      })
      .from(trials)
      .innerJoin(species, eq(species.id, trials.speciesId))
      .orderBy(desc(trials.createdAt));
    const visible = rows.filter((row) => canSeeTrial(member.role, row.status));
    if (!member.farmId) return visible.map((row) => ({ ...row, enrolmentStatus: null as string | null }));
    const enrolments = await tx.select({ trialId: trialEnrolments.trialId, status: trialEnrolments.status }).from(trialEnrolments);
    const byTrial = new Map(enrolments.map((enrolment) => [enrolment.trialId, enrolment.status as string]));
    return visible.map((row) => ({ ...row, enrolmentStatus: byTrial.get(row.id) ?? null }));
  });
}

async function loadTrial(tx: Transaction, member: Member, trialId: string) {
  const [trial] = await tx
    .select({
      id: trials.id,
      code: trials.code,
      title: trials.title,
      question: trials.question,
      status: trials.status,
      designKind: trials.designKind,
      speciesId: trials.speciesId,
      speciesName: species.commonName,
      outcomeFlushes: trials.outcomeFlushes,
      contaminatedHandling: trials.contaminatedHandling,
      protocolNotes: trials.protocolNotes,
      enrolmentDeadline: trials.enrolmentDeadline,
      ...timelineColumns,
      smallestDifference: trials.smallestDifference,
      expectedSd: trials.expectedSd,
      plannedFarms: trials.plannedFarms,
      expectedLoss: trials.expectedLoss,
      blocksPerRoom: trials.blocksPerRoom,
      roomIcc: trials.roomIcc,
      publishedAt: trials.publishedAt,
      withdrawalsAfterPublication: trials.withdrawalsAfterPublication,
    })
    .from(trials)
    .innerJoin(species, eq(species.id, trials.speciesId))
    .where(eq(trials.id, trialId));
  if (!trial || !canSeeTrial(member.role, trial.status)) {
    throw new AppError("not_found", "There is no such trial, or it is still a draft. Go back to Trials and pick one from the list.");
  }
  const arms: TrialArmView[] = await tx
    .select({
      id: trialArms.id,
      label: trialArms.label,
      isReference: trialArms.isReference,
      strainId: trialArms.strainId,
      strainCode: strains.code,
      strainName: strains.name,
      treatmentId: trialArms.treatmentId,
      treatmentName: treatments.name,
      treatmentKind: treatments.kind,
    })
    .from(trialArms)
    .innerJoin(strains, eq(strains.id, trialArms.strainId))
    .leftJoin(treatments, eq(treatments.id, trialArms.treatmentId))
    .where(eq(trialArms.trialId, trialId))
    .orderBy(asc(trialArms.position));
  return { ...trial, arms };
}

export type TrialBase = Awaited<ReturnType<typeof loadTrial>>;

/** One run of the analysis as a page lists it: when, who, what it read; its publication if it has one. */
export interface AnalysisRunView {
  id: string;
  run: number;
  ranAt: Date;
  ranByName: string;
  /** Null for the analysis a trial kept before runs were recorded. */
  inputs: AnalysisInputCounts | null;
  fingerprint: string | null;
  publication: { version: number; publishedAt: Date; publishedByName: string; reason: string | null } | null;
}

/** A published version of the report, with what it shows. */
export interface PublishedVersion {
  version: number;
  publishedAt: Date;
  reason: string | null;
  run: AnalysisRunView;
  results: StoredResults;
}

export interface TrialView extends TrialBase {
  /** The report the page shows: the run asked for, else the newest published version, else (coordinator only) the newest run. */
  results: StoredResults | null;
  shownRun: AnalysisRunView | null;
  /** Every run this member may read, newest first: all for the coordinator, the published ones for everybody else. */
  runs: AnalysisRunView[];
  /** Published versions, newest (the amendment in force) first. */
  versions: PublishedVersion[];
}

/**
 * A trial as the member may read it, with the runs of its analysis that member may see (row-level
 * security gives members and observers published runs only). For a farm's people each report marks
 * their own farm's row, from trial_report_farms, which they can read for their own farm only.
 */
export async function getTrial(member: Member, trialId: string, options: { run?: number } = {}): Promise<TrialView> {
  if (!/^[0-9a-f-]{36}$/i.test(trialId))
    throw new AppError("not_found", "There is no such trial. Go back to Trials and pick one from the list.");
  return asMember(member, async (tx) => {
    const trial = await loadTrial(tx, member, trialId);
    const rows = await tx
      .select({
        id: trialAnalyses.id,
        run: trialAnalyses.run,
        ranAt: trialAnalyses.ranAt,
        ranByName: trialAnalyses.ranByName,
        inputs: trialAnalyses.inputs,
        fingerprint: trialAnalyses.fingerprint,
        results: trialAnalyses.results,
        version: trialPublications.version,
        publishedAt: trialPublications.publishedAt,
        publishedByName: trialPublications.publishedByName,
        reason: trialPublications.reason,
      })
      .from(trialAnalyses)
      .leftJoin(trialPublications, eq(trialPublications.analysisId, trialAnalyses.id))
      .where(eq(trialAnalyses.trialId, trialId))
      .orderBy(desc(trialAnalyses.run));
    const own = member.farmId
      ? await tx
          .select({
            analysisId: trialReportFarms.analysisId,
            pseudonym: trialReportFarms.pseudonym,
            ownEstimates: trialReportFarms.ownEstimates,
          })
          .from(trialReportFarms)
          .where(and(eq(trialReportFarms.trialId, trialId), eq(trialReportFarms.farmId, member.farmId)))
      : [];
    const resultsOf = (row: (typeof rows)[number]): StoredResults => {
      const stored = row.results as StoredResults;
      const mine = own.find((entry) => entry.analysisId === row.id);
      return mine ? { ...stored, analysis: markOwnFarm(stored.analysis, mine) } : stored;
    };
    const runs: AnalysisRunView[] = rows.map((row) => ({
      id: row.id,
      run: row.run,
      ranAt: row.ranAt,
      ranByName: row.ranByName,
      inputs: row.inputs as AnalysisInputCounts | null,
      fingerprint: row.fingerprint,
      publication:
        row.version === null
          ? null
          : { version: row.version, publishedAt: row.publishedAt!, publishedByName: row.publishedByName!, reason: row.reason },
    }));
    const versions: PublishedVersion[] = rows
      .filter((row) => row.version !== null)
      .sort((a, b) => b.version! - a.version!)
      .map((row) => ({
        version: row.version!,
        publishedAt: row.publishedAt!,
        reason: row.reason,
        run: runs.find((run) => run.id === row.id)!,
        results: resultsOf(row),
      }));
    // Row-level security has already left out the runs this member may not read, so asking for one gives the default.
    const shown =
      rows.find((row) => row.run === options.run) ??
      (versions.length ? rows.find((row) => row.id === versions[0].run.id) : member.role === "coordinator" ? rows[0] : undefined);
    return {
      ...trial,
      results: shown ? resultsOf(shown) : null,
      shownRun: shown ? runs.find((run) => run.id === shown.id)! : null,
      runs,
      versions,
    };
  });
}

/**
 * A published trial's report for taking away (PDF, CSV): exactly what the report page shows the
 * member, their own farm marked and nobody else's, or not_found before publication.
 */
export async function getPublishedReport(member: Member, trialId: string): Promise<TrialView & { results: StoredResults }> {
  const trial = await getTrial(member, trialId);
  if (trial.status !== "published" || !trial.results)
    throw new AppError(
      "not_found",
      "This trial's report is not published yet. Its PDF and CSV can be downloaded once the coordinator publishes it.",
    );
  return { ...trial, results: trial.results };
}

/**
 * Whether enough farms have accepted to start the trial, and the blocks per arm they committed
 * between them: the trial page warns the coordinator, against the co-op's minimum and the plan.
 */
export async function getStartReadiness(
  member: Member,
  trialId: string,
): Promise<{ accepted: number; blocksPerArm: number; minimumFarms: number }> {
  return asMember(member, async (tx) => {
    const [{ blocksPerArm }] = await tx
      .select({ blocksPerArm: sql<number>`coalesce(sum(${trialEnrolments.blocksPerArm}), 0)::int` })
      .from(trialEnrolments)
      .where(and(eq(trialEnrolments.trialId, trialId), eq(trialEnrolments.status, "accepted")));
    return { accepted: await acceptedFarms(tx, trialId), blocksPerArm, minimumFarms: await minimumFarmsOf(tx) };
  });
}

async function acceptedFarms(tx: Transaction, trialId: string): Promise<number> {
  const [{ accepted }] = await tx
    .select({ accepted: sql<number>`count(*)::int` })
    .from(trialEnrolments)
    .where(and(eq(trialEnrolments.trialId, trialId), eq(trialEnrolments.status, "accepted")));
  return accepted;
}

async function minimumFarmsOf(tx: Transaction): Promise<number> {
  const [settings] = await tx.select({ minimumFarms: cooperativeSettings.minimumFarms }).from(cooperativeSettings);
  return settings?.minimumFarms ?? 3;
}

/** The coordinator's record of every state move, newest first (audit events are co-op level). */
export async function listTrialHistory(member: Member, trialId: string) {
  return asMember(member, (tx) =>
    tx
      .select({
        occurredAt: auditEvents.occurredAt,
        action: auditEvents.action,
        subject: auditEvents.subject,
        actorLabel: auditEvents.actorLabel,
        details: auditEvents.details,
      })
      .from(auditEvents)
      .where(and(like(auditEvents.action, "trial.%"), sql`${auditEvents.details}->>'trialId' = ${trialId}`))
      .orderBy(desc(auditEvents.occurredAt)),
  );
}

export async function listDesignOptions(member: Member) {
  return asMember(member, async (tx) => {
    const speciesRows = await tx
      .select({ id: species.id, name: species.commonName })
      .from(species)
      .where(eq(species.status, "active"))
      .orderBy(asc(species.commonName));
    const strainRows = await tx
      .select({ id: strains.id, code: strains.code, name: strains.name, speciesId: strains.speciesId })
      .from(strains)
      .where(eq(strains.status, "active"))
      .orderBy(asc(strains.code));
    const treatmentRows = await tx
      .select({ id: treatments.id, name: treatments.name, kind: treatments.kind })
      .from(treatments)
      .where(eq(treatments.status, "active"))
      .orderBy(asc(treatments.name));
    return { species: speciesRows, strains: strainRows, treatments: treatmentRows };
  });
}

/**
 * The spread between blocks the co-op has published per species, for the sample-size prefill: BE
 * over the first two flushes of uncontaminated blocks, pooled after taking out each farm's own
 * mean, from the newest release (so it changes only with a release, like every pooled figure),
 * and only for species with at least the co-op's minimum number of farms. The SD is given to
 * 0.1 BE point, as the form shows it.
 */
export async function listBlockSpreadBySpecies(): Promise<{
  minimumFarms: number;
  bySpecies: Record<string, { sd: number; blocks: number; farms: number }>;
}> {
  return withAnalystAccess(async (tx) => {
    const minimumFarms = await minimumFarmsOf(tx);
    const release = await latestRelease(tx);
    if (!release) return { minimumFarms, bySpecies: {} };
    const rows = (await releaseContents(tx, release.number, { flushWindow: "1-2" })).strainRows;
    const bySpecies: Record<string, { sd: number; blocks: number; farms: number }> = {};
    for (const speciesId of new Set(rows.map((row) => row.speciesId))) {
      const spread = withinFarmSpread(rows.filter((row) => row.speciesId === speciesId));
      if (spread && spread.farms >= minimumFarms)
        bySpecies[speciesId] = { ...spread, sd: roundTo(spread.sd, publishedSteps.efficiencyPoints) };
    }
    return { minimumFarms, bySpecies };
  });
}

/**
 * How alike blocks in one room are, per species, for a room-level trial's size: the co-op's
 * intraclass correlation of block BE within rooms (rooms compared within each farm and regime),
 * from the newest release's figures by climate regime, only where the co-op's minimum number of
 * farms ran two or more rooms of a regime; to 0.01, as the form shows it.
 */
export async function listRoomIccBySpecies(): Promise<Record<string, { icc: number; farms: number; rooms: number }>> {
  return withAnalystAccess(async (tx) => {
    const minimumFarms = await minimumFarmsOf(tx);
    const release = await latestRelease(tx);
    if (!release) return {};
    const rows = (await releaseContents(tx, release.number)).regimeRows;
    const bySpecies: Record<string, { icc: number; farms: number; rooms: number }> = {};
    for (const speciesId of new Set(rows.map((row) => row.speciesId))) {
      const pooled = pooledRoomIcc(
        rows.filter((row) => row.speciesId === speciesId),
        minimumFarms,
      );
      if (pooled) bySpecies[speciesId] = { ...pooled, icc: roundTo(pooled.icc, 0.01) };
    }
    return bySpecies;
  });
}

// ——— Design ———

async function nextTrialCode(tx: Transaction): Promise<string> {
  const year = new Date().getUTCFullYear();
  const rows = await tx
    .select({ code: trials.code })
    .from(trials)
    .where(like(trials.code, `T-${year}-%`));
  const highest = rows.reduce((max, row) => Math.max(max, Number(row.code.split("-")[2]) || 0), 0);
  return `T-${year}-${String(highest + 1).padStart(2, "0")}`;
}

export async function saveTrialDraft(member: Member, input: TrialDesignInput): Promise<{ id: string; code: string }> {
  return asMember(member, async (tx) => {
    const strainRows = await tx
      .select({ id: strains.id, speciesId: strains.speciesId, code: strains.code })
      .from(strains)
      .where(
        inArray(
          strains.id,
          input.arms.map((arm) => arm.strainId),
        ),
      );
    const designKind = input.designKind ?? "one_factor";
    if (designKind === "strain_by_method") {
      const treatmentIds = [...new Set(input.arms.flatMap((arm) => (arm.treatmentId ? [arm.treatmentId] : [])))];
      const treatmentRows = treatmentIds.length
        ? await tx
            .select({ id: treatments.id, name: treatments.name, kind: treatments.kind })
            .from(treatments)
            .where(inArray(treatments.id, treatmentIds))
        : [];
      const strainNames = await tx
        .select({ id: strains.id, name: strains.name })
        .from(strains)
        .where(
          inArray(
            strains.id,
            input.arms.map((arm) => arm.strainId),
          ),
        );
      const problems = crossedArmsProblems(input.arms, strainNames, treatmentRows);
      if (problems.length)
        throw new AppError(
          "invalid_input",
          problems[0],
          problems.map((message) => ({ field: "arms", message })),
        );
    }
    if (designKind === "rooms") {
      const treatmentIds = [...new Set(input.arms.flatMap((arm) => (arm.treatmentId ? [arm.treatmentId] : [])))];
      const treatmentRows = treatmentIds.length
        ? await tx.select({ id: treatments.id, kind: treatments.kind }).from(treatments).where(inArray(treatments.id, treatmentIds))
        : [];
      const problems = roomArmsProblems(input.arms, treatmentRows);
      if (problems.length)
        throw new AppError(
          "invalid_input",
          problems[0],
          problems.map((message) => ({ field: "arms", message })),
        );
    }
    input.arms.forEach((arm, index) => {
      const strain = strainRows.find((row) => row.id === arm.strainId);
      if (!strain)
        throw new AppError("invalid_input", `Arm ${index + 1}: pick a strain from the registry.`, [
          { field: "arms", message: `Arm ${index + 1}: pick a strain from the registry.` },
        ]);
      if (strain.speciesId !== input.speciesId) {
        const message = `Arm ${index + 1} (${arm.label}): strain ${strain.code} is not of the trial's species; pick one of its strains.`;
        throw new AppError("invalid_input", message, [{ field: "arms", message }]);
      }
    });
    const values = {
      title: input.title,
      question: input.question,
      speciesId: input.speciesId,
      designKind,
      outcomeFlushes: input.outcomeFlushes,
      contaminatedHandling: input.contaminatedHandling,
      protocolNotes: input.protocolNotes,
      enrolmentDeadline: input.enrolmentDeadline,
      inoculationFrom: input.inoculationFrom,
      inoculationTo: input.inoculationTo,
      fruitingFrom: input.fruitingFrom,
      fruitingTo: input.fruitingTo,
      dataDue: input.dataDue,
      smallestDifference: input.smallestDifference,
      expectedSd: input.expectedSd,
      plannedFarms: input.plannedFarms,
      expectedLoss: input.expectedLoss,
      blocksPerRoom: designKind === "rooms" ? (input.blocksPerRoom ?? null) : null,
      roomIcc: designKind === "rooms" ? (input.roomIcc ?? null) : null,
    };
    let id: string;
    let code: string;
    if (input.trialId) {
      const [current] = await tx.select({ status: trials.status, code: trials.code }).from(trials).where(eq(trials.id, input.trialId));
      if (!current) throw new AppError("not_found", "That trial no longer exists. Start a new design from Trials.");
      if (!isDesignEditable(current.status)) {
        throw new AppError(
          "conflict",
          `Trial ${current.code} is "${trialStatusLabels[current.status]}": its design is fixed once enrolment opens.`,
        );
      }
      await tx.update(trials).set(values).where(eq(trials.id, input.trialId));
      await tx.delete(trialArms).where(eq(trialArms.trialId, input.trialId));
      id = input.trialId;
      code = current.code;
    } else {
      code = await nextTrialCode(tx);
      const [created] = await tx
        .insert(trials)
        .values({ ...values, code, createdBy: member.id })
        .returning({ id: trials.id });
      id = created.id;
    }
    await tx.insert(trialArms).values(
      input.arms.map((arm, index) => ({
        trialId: id,
        label: arm.label,
        strainId: arm.strainId,
        treatmentId: arm.treatmentId,
        isReference: arm.isReference,
        position: index + 1,
      })),
    );
    await recordAudit(tx, {
      ...actor(member),
      action: input.trialId ? "trial.draft_saved" : "trial.created",
      subject: code,
      details: { trialId: id, arms: input.arms.length, designKind },
    });
    return { id, code };
  });
}

// ——— Lifecycle ———

/**
 * One step of the trial's lifecycle. Closing ("collecting") needs `reviewed`: the fingerprint of
 * the incomplete counts the coordinator confirmed (getCloseReview), refused when missing or when
 * records arrived since, so a result is never frozen on counts nobody saw; it makes run 1 of the
 * analysis. Publishing ("published") publishes one run as version 1: `analysisId`, or the newest.
 */
export async function moveTrial(
  member: Member,
  trialId: string,
  to: TrialStatus,
  options: { reviewed?: string; analysisId?: string } = {},
): Promise<void> {
  if (!can(member.role, "trial:manage")) throw new AppError("forbidden", "Only the co-op's coordinator moves a trial on.");
  await asMember(member, async (tx) => {
    const trial = await loadTrial(tx, member, trialId);
    try {
      assertMove(trial.status, to);
    } catch (error) {
      ruleError(error);
    }
    const changes: Partial<typeof trials.$inferInsert> = { status: to };
    if (to === "open") {
      refuseIf(openingProblem(trial.arms));
      if (trial.designKind === "strain_by_method") {
        // Saved drafts were checked; a strain or method edited in the registry since must not leave half a crossing open.
        const problems = crossedArmsProblems(
          trial.arms,
          trial.arms.map((arm) => ({ id: arm.strainId, name: arm.strainName })),
          trial.arms.flatMap((arm) =>
            arm.treatmentId ? [{ id: arm.treatmentId, name: arm.treatmentName ?? "", kind: arm.treatmentKind ?? undefined }] : [],
          ),
        );
        if (problems.length) throw new AppError("conflict", `${problems[0]} Edit the design before enrolment opens.`);
      }
    }
    if (to === "running") {
      refuseIf(startingProblem(await acceptedFarms(tx, trialId), await minimumFarmsOf(tx)));
      await tx
        .update(trialEnrolments)
        .set({ status: "dropped" })
        .where(and(eq(trialEnrolments.trialId, trialId), eq(trialEnrolments.status, "invited")));
    }
    let review: CloseReview | null = null;
    if (to === "collecting") {
      if (!options.reviewed)
        throw new AppError(
          "invalid_input",
          "Closing runs the analysis on what is in: read what is still incomplete on the trial page, tick the confirmation and close again.",
          [{ field: "reviewed", message: "Tick that you have read what is still incomplete." }],
        );
      review = await closeReviewOf(tx, trial);
      if (review.fingerprint !== options.reviewed)
        throw new AppError(
          "conflict",
          "Records have changed since you reviewed what is incomplete. Reload the trial page, read the counts again and confirm.",
        );
    }
    const now = new Date();
    let published: { run: number; version: number; answer: string } | null = null;
    if (to === "published") {
      const runs = await tx
        .select({ id: trialAnalyses.id, run: trialAnalyses.run, results: trialAnalyses.results })
        .from(trialAnalyses)
        .where(eq(trialAnalyses.trialId, trialId))
        .orderBy(desc(trialAnalyses.run));
      refuseIf(publishingProblem(runs.length));
      const chosen = options.analysisId ? runs.find((run) => run.id === options.analysisId) : runs[0];
      if (!chosen)
        throw new AppError("not_found", "That run of the analysis is not one of this trial's. Reload the trial page and pick again.");
      await tx.insert(trialPublications).values({
        trialId,
        analysisId: chosen.id,
        version: 1,
        publishedAt: now,
        publishedBy: member.id,
        publishedByName: member.name,
      });
      changes.publishedAt = now;
      published = { run: chosen.run, version: 1, answer: (chosen.results as StoredResults).analysis.answer };
    }
    await tx.update(trials).set(changes).where(eq(trials.id, trialId));
    await recordAudit(tx, {
      ...actor(member),
      action: "trial.status_changed",
      subject: trial.code,
      // What the coordinator confirmed on closing: counts only; on publishing, which run.
      details: review
        ? { trialId, from: trial.status, to, incomplete: review.totals }
        : published
          ? { trialId, from: trial.status, to, run: published.run, version: 1 }
          : { trialId, from: trial.status, to },
    });
    // Run 1 is made after the move, so its audit event follows the close's.
    if (to === "collecting") await storeAnalysisRun(tx, member, trial, { ranAt: now });
    if (published) {
      const people = await tx.select({ email: users.email }).from(users).where(eq(users.active, true));
      const mail = resultsPublishedMail({ trial, answer: published.answer, resultsUrl: `${appUrl()}/trials/${trialId}/results` });
      // One message per person, so nobody sees the others' addresses.
      for (const person of people) await deliver(tx, "trial-results", person.email, mail);
    }
  });
}

/** Queued in the transaction of the change it tells about; its opt-out link is made when it is sent. */
async function deliver(tx: Transaction, kind: MailKind, to: string, mail: TrialMail, link?: SecretLink): Promise<void> {
  await queueMail(tx, kind, { to, ...mail }, link);
}

/**
 * Runs the pre-declared analysis on the records in now and keeps the run: the blocks are read
 * through the analyst role, and only what the report may publish is stored (lib/trials/report.ts),
 * with what the run read (counts) and a fingerprint of the values it analysed. The run, and each
 * farm's pseudonym and own estimates for it (trial_report_farms, which only that farm's people
 * read, once the run is published), are written in the caller's transaction.
 */
async function storeAnalysisRun(
  tx: Transaction,
  member: Member,
  trial: TrialBase,
  options: { ranAt?: Date; refuseUnchanged?: boolean } = {},
): Promise<{ id: string; run: number; results: StoredResults }> {
  // One run at a time per trial, so two coordinators' clicks cannot take the same number.
  await tx.execute(sql`select 1 from trials where id = ${trial.id} for update`);
  const ranAt = options.ranAt ?? new Date();
  const enrolments = await tx
    .select({ status: trialEnrolments.status, farmId: trialEnrolments.farmId })
    .from(trialEnrolments)
    .where(eq(trialEnrolments.trialId, trial.id));
  const assignedRows = await tx
    .select({ armId: trialBlockAssignments.armId, assigned: sql<number>`count(*)::int` })
    .from(trialBlockAssignments)
    .where(eq(trialBlockAssignments.trialId, trial.id))
    .groupBy(trialBlockAssignments.armId);
  const assignedByArm = Object.fromEntries(assignedRows.map((row) => [row.armId, row.assigned]));
  const assigned = assignedRows.reduce((sum, row) => sum + row.assigned, 0);
  const armIds = trial.arms.map((arm) => arm.id);
  const outcome = { flushes: trial.outcomeFlushes, contaminatedHandling: trial.contaminatedHandling };
  const analysed = await withAnalystAccess(async (analyst) => {
    const [settings] = await analyst
      .select({ minimumFarms: cooperativeSettings.minimumFarms, showPerFarmEstimates: cooperativeSettings.showPerFarmEstimates })
      .from(cooperativeSettings);
    const { blockRows, harvestRows } = await trialBlockRows(analyst, armIds);
    const blockRooms = trial.designKind === "rooms" ? await trialBlockRoomsOf(analyst, blockRows) : undefined;
    const inputs = {
      ...(blockRooms ? { blockRooms } : {}),
      outcome,
      minimumFarms: settings?.minimumFarms ?? 3,
      showPerFarmEstimates: settings?.showPerFarmEstimates ?? false,
      arms: trial.arms,
      enrolments,
      assignedByArm,
      blockRows,
      harvestRows,
    };
    const report = trialReport({
      ...inputs,
      arms: trial.arms,
      // Unpredictable per run, so no order the app shows (ids, names, enrolment) gives the pseudonyms away.
      random: seededRandom(randomBytes(16).toString("hex")),
      blocksAssigned: assigned,
      design: trial,
      analysedAt: ranAt.toISOString(),
    });
    return { ...report, counts: analysisInputCounts(inputs), fingerprint: analysisFingerprint(inputs) };
  });
  const [latest] = await tx
    .select({ run: trialAnalyses.run, fingerprint: trialAnalyses.fingerprint })
    .from(trialAnalyses)
    .where(eq(trialAnalyses.trialId, trial.id))
    .orderBy(desc(trialAnalyses.run))
    .limit(1);
  if (options.refuseUnchanged && latest?.fingerprint === analysed.fingerprint)
    throw new AppError(
      "conflict",
      `Nothing has changed since run ${latest.run}: it analysed the same records (fingerprint ${analysed.fingerprint.slice(0, 8)}). Run again once new records are in.`,
    );
  const run = (latest?.run ?? 0) + 1;
  const [stored] = await tx
    .insert(trialAnalyses)
    .values({
      trialId: trial.id,
      run,
      ranAt,
      ranBy: member.id,
      ranByName: member.name,
      results: analysed.results,
      inputs: analysed.counts,
      fingerprint: analysed.fingerprint,
    })
    .returning({ id: trialAnalyses.id });
  if (analysed.farms.length) {
    await tx.insert(trialReportFarms).values(
      analysed.farms.map((farm) => ({
        trialId: trial.id,
        analysisId: stored.id,
        farmId: farm.farmKey,
        pseudonym: farm.pseudonym,
        ownEstimates: farm.ownEstimates,
      })),
    );
  }
  await recordAudit(tx, {
    ...actor(member),
    action: "trial.analysed",
    subject: `${trial.code}: run ${run}`,
    details: { trialId: trial.id, run, fingerprint: analysed.fingerprint, inputs: analysed.counts },
  });
  return { id: stored.id, run, results: analysed.results };
}

/**
 * The coordinator runs the analysis again on what has arrived, while the trial collects results or
 * after publication (to amend it); every run is kept. Refused when nothing changed since the last run.
 */
export async function runTrialAnalysis(member: Member, trialId: string): Promise<number> {
  if (!can(member.role, "trial:manage")) throw new AppError("forbidden", "Only the co-op's coordinator runs a trial's analysis.");
  return asMember(member, async (tx) => {
    const trial = await loadTrial(tx, member, trialId);
    if (!hasResults(trial.status))
      throw new AppError(
        "conflict",
        `The analysis runs once the trial is closed (Collecting results) and after publication; this one is "${trialStatusLabels[trial.status]}".`,
      );
    return (await storeAnalysisRun(tx, member, trial, { refuseUnchanged: true })).run;
  });
}

/**
 * After publication a correction is an amendment: a run not yet published becomes the next version,
 * with the coordinator's reason, shown above the versions before it, which stay as they were.
 */
export async function amendPublishedAnalysis(
  member: Member,
  trialId: string,
  input: { analysisId: string; reason: string },
): Promise<{ version: number }> {
  if (!can(member.role, "trial:manage")) throw new AppError("forbidden", "Only the co-op's coordinator amends a published trial.");
  const problem = amendmentReasonProblem(input.reason);
  if (problem) throw new AppError("invalid_input", problem, [{ field: "reason", message: problem }]);
  return asMember(member, async (tx) => {
    const trial = await loadTrial(tx, member, trialId);
    if (trial.status !== "published")
      throw new AppError(
        "conflict",
        `Only a published trial is amended; this one is "${trialStatusLabels[trial.status]}". Publish a run instead.`,
      );
    await tx.execute(sql`select 1 from trials where id = ${trialId} for update`);
    const [run] = await tx
      .select({
        id: trialAnalyses.id,
        run: trialAnalyses.run,
        results: trialAnalyses.results,
        inputs: trialAnalyses.inputs,
        version: trialPublications.version,
      })
      .from(trialAnalyses)
      .leftJoin(trialPublications, eq(trialPublications.analysisId, trialAnalyses.id))
      .where(and(eq(trialAnalyses.id, input.analysisId), eq(trialAnalyses.trialId, trialId)));
    if (!run) throw new AppError("not_found", "That run of the analysis is not one of this trial's. Reload the trial page and pick again.");
    if (run.version !== null)
      throw new AppError(
        "conflict",
        `Run ${run.run} is already published as version ${run.version}. Run the analysis again and amend with the new run.`,
      );
    const [inForce] = await tx
      .select({ version: trialPublications.version, run: trialAnalyses.run, inputs: trialAnalyses.inputs })
      .from(trialPublications)
      .innerJoin(trialAnalyses, eq(trialAnalyses.id, trialPublications.analysisId))
      .where(eq(trialPublications.trialId, trialId))
      .orderBy(desc(trialPublications.version))
      .limit(1);
    // Both versions stay readable, so their difference must not show a few farms' blocks: as with the
    // co-op's releases, records must have changed on no farm or on at least the minimum number of farms.
    const before = (inForce.inputs as AnalysisInputCounts | null)?.farmFingerprints;
    const after = (run.inputs as AnalysisInputCounts | null)?.farmFingerprints;
    const minimumFarms = await minimumFarmsOf(tx);
    const changed = before && after ? farmsChangedBetween(before, after) : 0;
    if (changed > 0 && changed < minimumFarms)
      throw new AppError(
        "conflict",
        `Since version ${inForce.version} (run ${inForce.run}) the records of ${changed === 1 ? "one farm" : `${changed} farms`} changed. Both versions stay readable, so comparing them would show ${changed === 1 ? "that farm's" : "those farms'"} blocks; an amendment needs changes from no farm or from at least ${minimumFarms} farms, the co-op's minimum. Wait for the other farms' late records and run the analysis again.`,
      );
    const version = inForce.version + 1;
    await tx.insert(trialPublications).values({
      trialId,
      analysisId: run.id,
      version,
      publishedBy: member.id,
      publishedByName: member.name,
      reason: input.reason.trim(),
    });
    await recordAudit(tx, {
      ...actor(member),
      action: "trial.amended",
      subject: `${trial.code}: version ${version}`,
      details: { trialId, run: run.run, version, reason: input.reason.trim() },
    });
    // Everyone was told of the results when they were published; each is told of the amendment too.
    const people = await tx.select({ email: users.email }).from(users).where(eq(users.active, true));
    const mail = resultsAmendedMail({
      trial,
      version,
      reason: input.reason.trim(),
      answer: (run.results as StoredResults).analysis.answer,
      resultsUrl: `${appUrl()}/trials/${trialId}/results`,
    });
    for (const person of people) await deliver(tx, "trial-results", person.email, mail);
    return { version };
  });
}

/** The demo seed closes its trial as the coordinator: the same run the app makes on closing, dated as the seed says. */
export async function analyseTrialAsCoordinator(
  member: Member,
  trialId: string,
  ranAt: Date,
): Promise<{ id: string; results: StoredResults }> {
  return asMember(member, async (tx) => storeAnalysisRun(tx, member, await loadTrial(tx, member, trialId), { ranAt }));
}

// ——— Enrolment ———

export async function listInvitableFarms(member: Member, trialId: string) {
  return asMember(member, async (tx) => {
    const all = await tx.select({ id: farms.id, name: farms.name }).from(farms).where(eq(farms.status, "active")).orderBy(asc(farms.name));
    const enrolled = await tx.select({ farmId: trialEnrolments.farmId }).from(trialEnrolments).where(eq(trialEnrolments.trialId, trialId));
    const taken = new Set(enrolled.map((row) => row.farmId));
    return all.filter((farm) => !taken.has(farm.id));
  });
}

/** Blocks per arm the design asks of each farm: its sample size at 80 % power, or null when the design does not say. */
function blocksPerArmWanted(trial: TrialBase): number | null {
  const { smallestDifference, expectedSd, plannedFarms, expectedLoss } = trial;
  if (smallestDifference === null || expectedSd === null || plannedFarms === null) return null;
  const panel = trialSampleSize({
    difference: smallestDifference,
    sd: expectedSd,
    plannedFarms,
    expectedLoss: expectedLoss ?? 0,
    arms: trial.arms.length,
  });
  return panel.ok ? panel.rows[0].perFarmPerArm : null;
}

export async function inviteFarms(member: Member, trialId: string, farmIds: string[]): Promise<number> {
  return asMember(member, async (tx) => {
    const trial = await loadTrial(tx, member, trialId);
    if (trial.status !== "open")
      throw new AppError(
        "conflict",
        `Farms can be invited only while the trial is "Open for enrolment"; it is "${trialStatusLabels[trial.status]}".`,
      );
    const farmRows = await tx
      .select({ id: farms.id, name: farms.name })
      .from(farms)
      .where(and(inArray(farms.id, farmIds), eq(farms.status, "active")));
    if (farmRows.length !== farmIds.length)
      throw new AppError("invalid_input", "One of the farms picked is not an active member any more. Reload the page and pick again.");
    const created = await tx
      .insert(trialEnrolments)
      .values(farmRows.map((farm) => ({ trialId, farmId: farm.id })))
      .onConflictDoNothing()
      .returning({ id: trialEnrolments.id, farmId: trialEnrolments.farmId });
    const managers = await tx
      .select({ email: users.email, farmId: users.farmId, timeZone: users.timeZone, dateStyle: users.dateStyle })
      .from(users)
      .where(and(inArray(users.farmId, farmIds), eq(users.role, "farm_manager"), eq(users.active, true)));
    let sent = 0;
    for (const enrolment of created) {
      const farm = farmRows.find((row) => row.id === enrolment.farmId)!;
      const optOut = secretLink({ for: "reminders-opt-out", enrolmentId: enrolment.id });
      for (const manager of managers.filter((row) => row.farmId === farm.id)) {
        // Each manager reads the answer-by date in their own zone and date style.
        const mail = trialInvitationMail({
          trial,
          farmName: farm.name,
          deadline: trial.enrolmentDeadline ? { date: trial.enrolmentDeadline, display: chosenDisplay(manager) } : null,
          blocksPerArmWanted: blocksPerArmWanted(trial),
          arms: trial.arms.length,
          enrolUrl: `${appUrl()}/trials/${trialId}`,
          optOutUrl: optOut.slot,
        });
        await deliver(tx, "trial-invitation", manager.email, mail, optOut);
        sent += 1;
      }
      await recordAudit(tx, {
        ...actor(member),
        action: "trial.farm_invited",
        subject: `${trial.code}: ${farm.name}`,
        details: { trialId, farmId: farm.id },
      });
    }
    return sent;
  });
}

export async function getOwnEnrolment(member: Member, trialId: string) {
  if (!member.farmId) return null;
  return asMember(member, async (tx) => {
    const [row] = await tx
      .select({
        id: trialEnrolments.id,
        status: trialEnrolments.status,
        blocksPerArm: trialEnrolments.blocksPerArm,
        randomisationSeed: trialEnrolments.randomisationSeed,
        remindersAllowed: trialEnrolments.remindersAllowed,
      })
      .from(trialEnrolments)
      .where(and(eq(trialEnrolments.trialId, trialId), eq(trialEnrolments.farmId, member.farmId!)));
    return row ?? null;
  });
}

/**
 * A farm manager puts their own farm on an open trial's list, as an invitation would: the farm then
 * accepts with its blocks per arm as usual. The coordinator sees the farm among the enrolments and
 * the request in the trial's history. Row-level security lets a manager add only their own farm.
 */
export async function askToJoinTrial(member: Member, trialId: string): Promise<void> {
  if (!member.farmId || member.role !== "farm_manager") throw new AppError("forbidden", "Only a farm's manager can ask for the farm.");
  await asMember(member, async (tx) => {
    const trial = await loadTrial(tx, member, trialId);
    if (trial.status !== "open")
      throw new AppError(
        "conflict",
        `Farms can join only while the trial is "Open for enrolment"; it is "${trialStatusLabels[trial.status]}".`,
      );
    if (trial.enrolmentDeadline && trial.enrolmentDeadline < new Date().toISOString().slice(0, 10))
      throw new AppError(
        "conflict",
        `The enrolment deadline was ${formatDate(trial.enrolmentDeadline, member.dateStyle)}. Ask the coordinator whether your farm can still join.`,
      );
    const created = await tx
      .insert(trialEnrolments)
      .values({ trialId, farmId: member.farmId! })
      .onConflictDoNothing()
      .returning({ id: trialEnrolments.id });
    if (!created.length) throw new AppError("conflict", "Your farm is already on this trial's list. Answer the invitation below.");
    // Co-op level (no farm), so it shows in the coordinator's history of the trial.
    await recordAudit(tx, {
      ...actor(member),
      action: "trial.farm_asked_to_join",
      subject: trial.code,
      details: { trialId, farm: member.farmName ?? "" },
    });
  });
}

/** The farm manager answers: accepting commits blocks per arm and makes the randomised list from a fresh, recorded seed. */
export async function respondToInvitation(
  member: Member,
  trialId: string,
  answer: { accept: boolean; blocksPerArm: number | null; roomIds?: readonly string[] },
): Promise<void> {
  if (!member.farmId) throw new AppError("forbidden", "Only a farm's manager can answer for the farm.");
  await asMember(member, async (tx) => {
    const trial = await loadTrial(tx, member, trialId);
    if (trial.status !== "open") throw new AppError("conflict", `Enrolment is closed: the trial is "${trialStatusLabels[trial.status]}".`);
    const [enrolment] = await tx
      .select()
      .from(trialEnrolments)
      .where(and(eq(trialEnrolments.trialId, trialId), eq(trialEnrolments.farmId, member.farmId!)));
    if (!enrolment) throw new AppError("forbidden", "Your farm has not been invited to this trial. Ask the coordinator for an invitation.");
    if (enrolment.status !== "invited") throw new AppError("conflict", `Your farm has already answered (${enrolment.status}).`);
    if (answer.accept && trial.enrolmentDeadline && trial.enrolmentDeadline < todayUtc()) {
      throw new AppError(
        "conflict",
        `The enrolment deadline was ${formatDate(trial.enrolmentDeadline, member.dateStyle)}. Ask the coordinator whether your farm can still join.`,
      );
    }
    if (!answer.accept) {
      await tx.update(trialEnrolments).set({ status: "declined", respondedAt: new Date() }).where(eq(trialEnrolments.id, enrolment.id));
      await recordAudit(tx, {
        ...actor(member),
        farmId: member.farmId,
        action: "trial.enrolment_declined",
        subject: trial.code,
        details: { trialId },
      });
      return;
    }
    const seed = `${trial.code}/${randomBytes(12).toString("hex")}`;
    const codePrefix = blockCodePrefix(trial.code, member.farmName ?? "");
    const drawn = trial.designKind === "rooms" ? await drawOwnRooms(tx, member, trial, seed, answer.roomIds ?? []) : null;
    const list: (ListEntry & { roomId?: string })[] = drawn
      ? roomBlockList(drawn, trial.blocksPerRoom ?? 1, codePrefix)
      : permutedBlockList({ seed, armIds: trial.arms.map((arm) => arm.id), blocksPerArm: answer.blocksPerArm!, codePrefix });
    // A room-level trial: the most blocks any arm gets, as its rooms were drawn (the arms differ by a room at most).
    const blocksPerArm = drawn
      ? Math.max(...trial.arms.map((arm) => list.filter((entry) => entry.armId === arm.id).length))
      : answer.blocksPerArm!;
    await tx
      .update(trialEnrolments)
      .set({ status: "accepted", blocksPerArm, randomisationSeed: seed, respondedAt: new Date() })
      .where(eq(trialEnrolments.id, enrolment.id));
    if (drawn)
      await tx
        .insert(trialRoomAssignments)
        .values(drawn.map((entry) => ({ trialId, farmId: member.farmId!, enrolmentId: enrolment.id, ...entry })));
    await tx.insert(trialBlockAssignments).values(
      list.map((entry) => ({
        trialId,
        farmId: member.farmId!,
        enrolmentId: enrolment.id,
        armId: entry.armId,
        blockCode: entry.blockCode,
        sequence: entry.sequence,
        permutedBlock: entry.permutedBlock,
        roomId: entry.roomId ?? null,
      })),
    );
    await recordAudit(tx, {
      ...actor(member),
      farmId: member.farmId,
      action: "trial.enrolment_accepted",
      subject: trial.code,
      // Counts and the seed only: the farm's own audit log, but room names stay on the rooms' pages.
      details: { trialId, blocksPerArm, seed, blocks: list.length, ...(drawn ? { rooms: drawn.length } : {}) },
    });
    const optOut = secretLink({ for: "reminders-opt-out", enrolmentId: enrolment.id });
    const mail = enrolmentConfirmationMail({
      trial,
      farmName: member.farmName ?? "Your farm",
      blocksPerArm,
      arms: trial.arms.length,
      listUrl: `${appUrl()}/trials/${trialId}/labels`,
      optOutUrl: optOut.slot,
    });
    await deliver(tx, "trial-enrolment", member.email, mail, optOut);
  });
}

/**
 * A room-level trial: the farm's own fruiting rooms it picked, checked (its own, not retired, at
 * least one per arm) and drawn to the arms with the enrolment's seed (drawRoomsToArms).
 */
async function drawOwnRooms(tx: Transaction, member: Member, trial: TrialBase, seed: string, roomIds: readonly string[]) {
  const picked = [...new Set(roomIds)];
  const own = picked.length
    ? await tx
        .select({ id: fruitingRooms.id })
        .from(fruitingRooms)
        .where(and(inArray(fruitingRooms.id, picked), eq(fruitingRooms.farmId, member.farmId!), isNull(fruitingRooms.retiredOn)))
    : [];
  if (own.length !== picked.length)
    throw new AppError("invalid_input", "Not enrolled: pick rooms of your own farm that are still in use.", [
      { field: "roomIds", message: "One of the rooms picked is retired or not your farm's. Reload the page and pick again." },
    ]);
  try {
    return drawRoomsToArms({ seed, armIds: trial.arms.map((arm) => arm.id), roomIds: picked });
  } catch (error) {
    if (error instanceof TrialRuleError) throw new AppError("invalid_input", error.message, [{ field: "roomIds", message: error.message }]);
    throw error;
  }
}

/** A room-level trial: the farm's own draw of its rooms to arms, in the order drawn, with each arm's regime. */
export async function listOwnRoomDraw(member: Member, trialId: string) {
  if (!member.farmId) return [];
  return asMember(member, (tx) =>
    tx
      .select({
        sequence: trialRoomAssignments.sequence,
        roomName: fruitingRooms.name,
        armLabel: trialArms.label,
        strainName: strains.name,
        regimeName: treatments.name,
      })
      .from(trialRoomAssignments)
      .innerJoin(fruitingRooms, eq(fruitingRooms.id, trialRoomAssignments.roomId))
      .innerJoin(trialArms, eq(trialArms.id, trialRoomAssignments.armId))
      .innerJoin(strains, eq(strains.id, trialArms.strainId))
      .leftJoin(treatments, eq(treatments.id, trialArms.treatmentId))
      .where(and(eq(trialRoomAssignments.trialId, trialId), eq(trialRoomAssignments.farmId, member.farmId!)))
      .orderBy(asc(trialRoomAssignments.sequence)),
  );
}

/** The farm's own randomised list; row-level security returns nothing for another farm. */
export async function listOwnAssignments(member: Member, trialId: string) {
  return asMember(member, (tx) =>
    tx
      .select({
        sequence: trialBlockAssignments.sequence,
        permutedBlock: trialBlockAssignments.permutedBlock,
        blockCode: trialBlockAssignments.blockCode,
        armLabel: trialArms.label,
        strainCode: strains.code,
        strainName: strains.name,
        treatmentName: treatments.name,
        treatmentCode: treatments.code,
        treatmentKind: treatments.kind,
        roomName: fruitingRooms.name,
      })
      .from(trialBlockAssignments)
      .innerJoin(trialArms, eq(trialArms.id, trialBlockAssignments.armId))
      .innerJoin(strains, eq(strains.id, trialArms.strainId))
      .leftJoin(treatments, eq(treatments.id, trialArms.treatmentId))
      // The farm's own room (row-level security of fruiting_rooms: nobody else reads its name).
      .leftJoin(fruitingRooms, eq(fruitingRooms.id, trialBlockAssignments.roomId))
      .where(and(eq(trialBlockAssignments.trialId, trialId), member.farmId ? eq(trialBlockAssignments.farmId, member.farmId) : sql`false`))
      .orderBy(asc(trialBlockAssignments.sequence)),
  );
}

/**
 * The farm's randomised list as a season log to fill in and upload (`trialListCsv`): each listed
 * block with the strain, trial, arm and fruiting method its arm fixes.
 */
export async function getTrialListSeasonLog(member: Member, trialId: string): Promise<{ fileName: string; csv: string }> {
  const trial = await getTrial(member, trialId);
  const list = await listOwnAssignments(member, trialId);
  if (!list.length) throw new AppError("not_found", "Your farm has no list for this trial. Accept the invitation on the trial page first.");
  const csv = trialListCsv(
    list.map((entry) => ({
      blockCode: entry.blockCode,
      trialCode: trial.code,
      armLabel: entry.armLabel,
      strainCode: entry.strainCode,
      // The season log has a column for the fruiting method only; a humidity regime belongs to the room, not the block.
      fruitingMethodCode: entry.treatmentKind === "fruiting_method" ? entry.treatmentCode : null,
      roomName: entry.roomName,
    })),
  );
  return { fileName: `${trial.code}-block-list.csv`, csv };
}

// ——— Following ———

export type FarmProgress = TimelineProgress;

/** What is still missing from a farm's records (lib/trials/timeline.ts); being behind is a matter of the timeline. */
export const dueItems = missingData;

/** The trial's timeline dates, as lib/trials/timeline.ts reads them. */
export function timelineOf(trial: TrialTimeline): TrialTimeline {
  const { inoculationFrom, inoculationTo, fruitingFrom, fruitingTo, dataDue } = trial;
  return { inoculationFrom, inoculationTo, fruitingFrom, fruitingTo, dataDue };
}

/** The farm's own progress, read under its own context. */
export async function getOwnProgress(member: Member, trial: TrialBase): Promise<FarmProgress | null> {
  if (!member.farmId) return null;
  return asMember(member, async (tx) => {
    const list = await tx
      .select({ blockCode: trialBlockAssignments.blockCode })
      .from(trialBlockAssignments)
      .where(and(eq(trialBlockAssignments.trialId, trial.id), eq(trialBlockAssignments.farmId, member.farmId!)));
    if (!list.length) return null;
    const [counts] = await progressCounts(tx, trial, member.farmId!);
    return { blocksListed: list.length, ...(counts ?? emptyCounts(trial)) };
  });
}

function emptyCounts(trial: TrialBase) {
  return { blocksMade: 0, fruiting: 0, contaminated: 0, flushesRecorded: Array.from({ length: trial.outcomeFlushes }, () => 0) };
}

/** Counts only: how many blocks, never how much they weighed. */
async function progressCounts(tx: Transaction, trial: TrialBase, farmId?: string) {
  const armIds = trial.arms.map((arm) => arm.id);
  if (!armIds.length) return [];
  const flushColumns = Array.from(
    { length: trial.outcomeFlushes },
    (_, index) => sql`count(*) FILTER (WHERE EXISTS (SELECT 1 FROM harvests h WHERE h.block_id = b.id AND h.flush = ${index + 1}))::int`,
  );
  const result = await tx.execute(sql`
    SELECT b.farm_id,
           count(*)::int AS made,
           count(*) FILTER (WHERE b.contaminated)::int AS contaminated,
           count(*) FILTER (WHERE EXISTS (SELECT 1 FROM harvests h WHERE h.block_id = b.id))::int AS fruiting,
           ARRAY[${sql.join(flushColumns, sql`, `)}] AS flushes
    FROM blocks b
    WHERE b.trial_arm_id IN (${sql.join(
      armIds.map((id) => sql`${id}::uuid`),
      sql`, `,
    )})
      ${farmId ? sql`AND b.farm_id = ${farmId}::uuid` : sql``}
    GROUP BY b.farm_id`);
  return (result.rows as { farm_id: string; made: number; contaminated: number; fruiting: number; flushes: number[] }[]).map((row) => ({
    farmId: row.farm_id,
    blocksMade: row.made,
    fruiting: row.fruiting,
    contaminated: row.contaminated,
    flushesRecorded: row.flushes.map(Number),
  }));
}

/**
 * The coordinator's view: every enrolled farm with its counts, read through the analyst role, what
 * is still missing, why it is behind the timeline (if it is), and when it was last reminded.
 */
export async function listTrialProgress(member: Member, trial: TrialBase, today = todayUtc()) {
  const enrolled = await asMember(member, async (tx) => {
    const rows = await tx
      .select({
        enrolmentId: trialEnrolments.id,
        farmId: trialEnrolments.farmId,
        farmName: farms.name,
        status: trialEnrolments.status,
        blocksPerArm: trialEnrolments.blocksPerArm,
        remindersAllowed: trialEnrolments.remindersAllowed,
      })
      .from(trialEnrolments)
      .innerJoin(farms, eq(farms.id, trialEnrolments.farmId))
      .where(eq(trialEnrolments.trialId, trial.id))
      .orderBy(asc(farms.name));
    const reminded = await tx
      .select({
        enrolmentId: trialReminders.enrolmentId,
        lastRemindedAt: sql<Date>`max(${trialReminders.sentAt})`.mapWith(trialReminders.sentAt),
      })
      .from(trialReminders)
      .where(eq(trialReminders.trialId, trial.id))
      .groupBy(trialReminders.enrolmentId);
    return rows.map((row) => ({
      ...row,
      lastRemindedAt: reminded.find((entry) => entry.enrolmentId === row.enrolmentId)?.lastRemindedAt ?? null,
    }));
  });
  const counts = await withAnalystAccess((analyst) => progressCounts(analyst, trial));
  return enrolled.map((row) => {
    const farmCounts = counts.find((count) => count.farmId === row.farmId);
    const progress: FarmProgress = {
      blocksListed: (row.blocksPerArm ?? 0) * trial.arms.length,
      ...(farmCounts
        ? {
            blocksMade: farmCounts.blocksMade,
            fruiting: farmCounts.fruiting,
            contaminated: farmCounts.contaminated,
            flushesRecorded: farmCounts.flushesRecorded,
          }
        : emptyCounts(trial)),
    };
    const taking = row.status === "accepted";
    const due = taking ? missingData(progress) : [];
    const behindWhy = taking ? behindReasons(timelineOf(trial), progress, today) : [];
    return { ...row, progress, due, behindWhy, behind: behindWhy.length > 0 };
  });
}

export interface CloseReviewRow {
  farmId: string;
  farmName: string;
  armLabel: string;
  counts: IncompleteCounts;
}

/** What closing now would leave incomplete, per farm and arm, with a fingerprint of those counts for the confirmation. */
export interface CloseReview {
  rows: CloseReviewRow[];
  totals: IncompleteCounts;
  fingerprint: string;
}

/**
 * The coordinator's review before closing: for each farm and arm, blocks not in a season log,
 * not through the outcome's flushes, without wet mass or moisture, not yet spent, and what
 * closing now would count or leave out. Counts only: the blocks are read through the analyst
 * role and no mass leaves this function.
 */
export async function getCloseReview(member: Member, trialId: string): Promise<CloseReview> {
  if (!can(member.role, "trial:follow-all-farms"))
    throw new AppError("forbidden", "Only the co-op's coordinator sees every farm's progress in a trial.");
  return asMember(member, async (tx) => closeReviewOf(tx, await loadTrial(tx, member, trialId)));
}

/** A trial's blocks and their harvests as the analysis and the close review read them (as the analyst: aggregates only leave). */
async function trialBlockRows(analyst: Transaction, armIds: string[]) {
  if (!armIds.length) return { blockRows: [], harvestRows: [] };
  const blockRows = await analyst
    .select({
      id: blocks.id,
      farmId: blocks.farmId,
      armId: blocks.trialArmId,
      wetMassG: blocks.wetMassG,
      moisture: blocks.moisture,
      contaminated: blocks.contaminated,
      spentMassG: blocks.spentMassG,
    })
    .from(blocks)
    .where(inArray(blocks.trialArmId, armIds));
  const harvestRows = blockRows.length
    ? await analyst
        .select({ blockId: harvests.blockId, flush: harvests.flush, freshMassG: harvests.freshMassG })
        .from(harvests)
        .where(
          inArray(
            harvests.blockId,
            blockRows.map((row) => row.id),
          ),
        )
    : [];
  return { blockRows, harvestRows };
}

/** A room-level trial's blocks' fruiting rooms, by opaque room id (never a name), through the analyst's columns. */
async function trialBlockRoomsOf(analyst: Transaction, blockRows: readonly { id: string }[]) {
  if (!blockRows.length) return new Map<string, string | null>();
  const ids = blockRows.map((row) => row.id);
  const moves = await analyst
    .select({ blockId: blockRoomMoves.blockId, roomId: blockRoomMoves.roomId, movedOn: blockRoomMoves.movedOn })
    .from(blockRoomMoves)
    .where(inArray(blockRoomMoves.blockId, ids));
  const harvestDays = await analyst
    .select({ blockId: harvests.blockId, harvestedOn: harvests.harvestedOn })
    .from(harvests)
    .where(inArray(harvests.blockId, ids));
  return trialBlockRooms(moves, harvestDays);
}

async function closeReviewOf(tx: Transaction, trial: TrialBase): Promise<CloseReview> {
  const enrolled = await tx
    .select({ farmId: trialEnrolments.farmId, blocksPerArm: trialEnrolments.blocksPerArm })
    .from(trialEnrolments)
    .where(and(eq(trialEnrolments.trialId, trial.id), eq(trialEnrolments.status, "accepted")));
  const armIds = trial.arms.map((arm) => arm.id);
  const blockRecords = await withAnalystAccess(async (analyst) => {
    const { blockRows, harvestRows } = await trialBlockRows(analyst, armIds);
    const byBlock = new Map<string, TrialBlockRecord["harvests"]>();
    for (const harvest of harvestRows) byBlock.set(harvest.blockId, [...(byBlock.get(harvest.blockId) ?? []), harvest]);
    return blockRows.map((row) => ({
      farmId: row.farmId,
      armId: row.armId!,
      block: { ...row, harvests: byBlock.get(row.id) ?? [] } satisfies TrialBlockRecord,
    }));
  });
  // Farms taking part, and any other farm whose blocks name the trial's arms: the analysis counts those too.
  const farmIds = [...new Set([...enrolled.map((row) => row.farmId), ...blockRecords.map((row) => row.farmId)])];
  const farmRows = farmIds.length
    ? await tx.select({ id: farms.id, name: farms.name }).from(farms).where(inArray(farms.id, farmIds)).orderBy(asc(farms.name))
    : [];
  const protocol = { flushes: trial.outcomeFlushes, contaminatedHandling: trial.contaminatedHandling };
  const rows = farmRows.flatMap((farm) =>
    trial.arms.map((arm) => ({
      farmId: farm.id,
      farmName: farm.name,
      armLabel: arm.label,
      counts: incompleteCounts(
        blockRecords.filter((row) => row.farmId === farm.id && row.armId === arm.id).map((row) => row.block),
        enrolled.find((row) => row.farmId === farm.id)?.blocksPerArm ?? 0,
        protocol,
      ),
    })),
  );
  const totals = incompleteCounts([], 0, protocol);
  for (const { counts } of rows) {
    for (const key of [
      "listed",
      "notInSeasonLog",
      "inSeasonLog",
      "withoutOutcomeFlushes",
      "withoutMass",
      "notSpent",
      "contaminated",
      "wouldCount",
    ] as const)
      totals[key] += counts[key];
    for (const reason of Object.keys(counts.leftOut) as (keyof IncompleteCounts["leftOut"])[])
      totals.leftOut[reason] += counts.leftOut[reason];
  }
  const fingerprint = createHash("sha256")
    .update(JSON.stringify(rows.map((row) => [row.farmId, row.armLabel, row.counts])))
    .digest("hex")
    .slice(0, 32);
  return { rows, totals, fingerprint };
}

export async function sendTrialReminder(member: Member, trialId: string, farmId: string): Promise<number> {
  const trial = await getTrial(member, trialId);
  if (!can(member.role, "trial:manage")) throw new AppError("forbidden", "Only the co-op's coordinator sends trial reminders.");
  if (!remindersRun(trial.status))
    throw new AppError("conflict", `Reminders go out only while a trial is running; this one is "${trialStatusLabels[trial.status]}".`);
  const farmsProgress = await listTrialProgress(member, trial);
  const farm = farmsProgress.find((row) => row.farmId === farmId);
  if (!farm || farm.status !== "accepted") throw new AppError("not_found", "That farm is not taking part in this trial.");
  if (!farm.remindersAllowed) throw new AppError("conflict", `${farm.farmName} has asked not to get reminders about this trial.`);
  if (!farm.behind) throw new AppError("conflict", `${farm.farmName} has nothing due yet against the trial's timeline; no reminder sent.`);
  return asMember(member, async (tx) => {
    // The same claim as the daily sweep's: one reminder a day per farm, and none once the trial is closed.
    const claimed = await claimReminder(tx, farm.enrolmentId, "by-hand");
    if (!claimed) throw new AppError("conflict", `${farm.farmName} has already had a reminder about this trial today; try again tomorrow.`);
    await recordAudit(tx, {
      ...actor(member),
      action: "trial.reminder_sent",
      subject: `${trial.code}: ${farm.farmName}`,
      details: { trialId, farmId, kind: "by-hand" },
    });
    return queueReminderMail(tx, { ...claimed, enrolmentId: farm.enrolmentId, items: farm.behindWhy });
  });
}

export interface ClaimedReminder {
  trialId: string;
  trialCode: string;
  trialTitle: string;
  farmName: string;
  emails: string[];
}

/**
 * Claims today's reminder for an enrolment (app_claim_trial_reminder, 0035): null when the farm
 * has had one today, stopped them, no longer takes part, or the trial is no longer running.
 */
export async function claimReminder(
  tx: Transaction,
  enrolmentId: string,
  kind: "before-due" | "behind" | "by-hand",
): Promise<ClaimedReminder | null> {
  const result = await tx.execute<{ trial_id: string; trial_code: string; trial_title: string; farm_name: string; emails: string[] }>(
    sql`select * from app_claim_trial_reminder(${enrolmentId}::uuid, ${kind})`,
  );
  const row = result.rows[0];
  return row
    ? { trialId: row.trial_id, trialCode: row.trial_code, trialTitle: row.trial_title, farmName: row.farm_name, emails: row.emails }
    : null;
}

/** The reminder e-mail to each of the farm's managers, in the claim's transaction; returns how many. */
export async function queueReminderMail(tx: Transaction, reminder: ClaimedReminder & { enrolmentId: string; items: string[] }) {
  const optOut = secretLink({ for: "reminders-opt-out", enrolmentId: reminder.enrolmentId });
  const mail = trialReminderMail({
    trial: { code: reminder.trialCode, title: reminder.trialTitle },
    farmName: reminder.farmName,
    due: reminder.items,
    progressUrl: `${appUrl()}/trials/${reminder.trialId}`,
    optOutUrl: optOut.slot,
  });
  for (const email of reminder.emails) await deliver(tx, "trial-reminder", email, mail, optOut);
  return reminder.emails.length;
}

// ——— Unsubscribe ———

/** From the public unsubscribe link: returns the trial's code, or null for a link that is not ours. */
export async function optOutOfReminders(token: string): Promise<string | null> {
  const enrolmentId = verifyOptOutToken(token, optOutSecret());
  if (!enrolmentId) return null;
  return asNobody(async (tx) => {
    const result = await tx.execute(sql`select app_trial_reminders_opt_out(${enrolmentId}::uuid) as code`);
    return (result.rows[0] as { code: string | null } | undefined)?.code ?? null;
  });
}

export interface ReminderChoice {
  trialCode: string;
  remindersAllowed: boolean;
}

/** What the unsubscribe page shows before anyone clicks: the trial and whether reminders are on. Changes nothing. */
export async function getReminderChoice(token: string): Promise<ReminderChoice | null> {
  const enrolmentId = verifyOptOutToken(token, optOutSecret());
  if (!enrolmentId) return null;
  return asNobody(async (tx) => {
    const result = await tx.execute<{ trial_code: string; reminders_allowed: boolean }>(
      sql`select * from app_trial_reminders_state(${enrolmentId}::uuid)`,
    );
    const row = result.rows[0];
    return row ? { trialCode: row.trial_code, remindersAllowed: row.reminders_allowed } : null;
  });
}

/** The undo on the unsubscribe page: reminders for that farm and trial come again. Returns the trial's code, or null. */
export async function optBackIntoReminders(token: string): Promise<string | null> {
  const enrolmentId = verifyOptOutToken(token, optOutSecret());
  if (!enrolmentId) return null;
  return asNobody(async (tx) => {
    const result = await tx.execute<{ code: string | null }>(sql`select app_trial_reminders_opt_in(${enrolmentId}::uuid) as code`);
    return result.rows[0]?.code ?? null;
  });
}
