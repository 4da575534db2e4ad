import type { Metadata } from "next";
import { trialOrNotFound } from "../_components/trial-or-not-found";
import Link from "next/link";
import { ButtonLink } from "@/components/ui/button";
import { Card } from "@/components/ui/card";
import { Caution } from "@/components/ui/caution";
import { Notice } from "@/components/ui/notice";
import { PageHeader } from "@/components/ui/page-header";
import { requirePage } from "@/lib/auth/guard";
import { describeAuditEvent } from "@/lib/audit/sentences";
import { can } from "@/lib/auth/permissions";
import {
  dueItems,
  getCloseReview,
  getOwnEnrolment,
  getOwnProgress,
  getStartReadiness,
  listOwnRoomDraw,
  listInvitableFarms,
  listTrialHistory,
  listTrialProgress,
  timelineOf,
  type CloseReview,
  type TrialView,
} from "@/lib/data/trials";
import { hasResults, moveLabels, nextStatuses, remindersRun, trialStatusLabels, type TrialStatus } from "@/lib/trials/lifecycle";
import { crossingOf, enrolmentWarnings, trialSampleSize, type SampleSizeInput } from "@/lib/trials/sample-size";
import { behindReasons } from "@/lib/trials/timeline";
import { askToJoinTrialAction, inviteFarmsAction, moveTrialAction, respondToInvitationAction, sendReminderAction } from "../actions";
import { ActionForm } from "@/components/forms/action-form";
import { AnalysisRunsCard, RunChoice } from "../_components/analysis-runs";
import { CloseReviewCard } from "../_components/close-review";
import { RoomDrawTable, RoomPickForm } from "../_components/room-enrolment";
import { listRoomChoices } from "@/lib/data/rooms";
import { ProtocolSummary } from "../_components/protocol-summary";
import { StatusBadge } from "../_components/status-badge";
import { TrialTimelineBar } from "../_components/trial-timeline";
import { todayUtc } from "@/lib/import/dates";
import { formatDateTime, formatDay, type TimeDisplay } from "@/lib/time/display";
import { timeDisplayFor } from "@/lib/time/member-display";
import { ScrollFrame } from "@/components/ui/scroll-frame";
import { agree, count } from "@/lib/words";

export const metadata: Metadata = { title: "Trial" };

export default async function TrialPage({ params }: { params: Promise<{ trialId: string }> }) {
  const member = await requirePage("trial:read");
  const { trialId } = await params;
  const trial = await trialOrNotFound(member, trialId);
  const display = await timeDisplayFor(member);
  const coordinator = can(member.role, "trial:manage");
  const showResults = (coordinator && hasResults(trial.status)) || trial.status === "published";
  // Before closing, the coordinator reads what is still incomplete and confirms it in the close form.
  const review = coordinator && trial.status === "running" ? await getCloseReview(member, trial.id) : null;
  return (
    <>
      <PageHeader title={trial.title} lead={trial.question}>
        {showResults ? (
          <ButtonLink href={`/trials/${trial.id}/results`}>
            {trial.status === "published" ? "Read the results" : "See the analysis"}
          </ButtonLink>
        ) : null}
      </PageHeader>
      <div className="mb-6 flex flex-wrap items-center gap-3">
        <span className="font-mono text-sm text-ink-soft">{trial.code}</span>
        <StatusBadge status={trial.status} />
        {trial.versions.length ? (
          <span className="text-sm text-ink-soft" data-testid="version-in-force">
            {trial.versions[0].version === 1
              ? `Results published ${formatDay(trial.versions[0].publishedAt, display)}`
              : `Results amended ${formatDay(trial.versions[0].publishedAt, display)} (version ${trial.versions[0].version})`}
          </span>
        ) : null}
      </div>
      <div className="grid grid-cols-1 gap-6 lg:grid-cols-[minmax(0,3fr)_minmax(0,2fr)]">
        <div className="space-y-6">
          <Card title="Timeline">
            <TrialTimelineBar timeline={timelineOf(trial)} today={todayUtc()} />
          </Card>
          {member.farmId ? <FarmSection trial={trial} member={member} /> : null}
          {review ? <CloseReviewCard review={review} outcomeFlushes={trial.outcomeFlushes} /> : null}
          {coordinator && (trial.runs.length || hasResults(trial.status)) ? <AnalysisRunsCard trial={trial} display={display} /> : null}
          {coordinator && trial.status !== "draft" ? <CoordinatorFollowing trial={trial} member={member} display={display} /> : null}
          <ProtocolSummary trial={trial} dateStyle={display.dateStyle} />
        </div>
        <div className="space-y-6">
          {coordinator ? <CoordinatorControls trial={trial} member={member} review={review} display={display} /> : null}
        </div>
      </div>
    </>
  );
}

type Member = Awaited<ReturnType<typeof requirePage>>;

const answerLabels: Record<string, string> = {
  invited: "No answer yet",
  accepted: "Taking part",
  declined: "Declined",
  dropped: "Dropped out",
};

async function CoordinatorControls(props: { trial: TrialView; member: Member; review: CloseReview | null; display: TimeDisplay }) {
  const { trial, member, review, display } = props;
  const [history, readiness] = await Promise.all([listTrialHistory(member, trial.id), getStartReadiness(member, trial.id)]);
  const moves = nextStatuses(trial.status);
  return (
    <>
      <Card title="Move the trial on">
        {trial.status === "open" && readiness.accepted < readiness.minimumFarms ? (
          <div className="mb-3" data-testid="too-few-farms">
            <Notice tone="caution" title="Not enough farms to start">
              <p>
                {readiness.accepted} of the {readiness.minimumFarms} farms a trial needs {agree(readiness.accepted, "has", "have")}{" "}
                accepted. It can start only once at least {readiness.minimumFarms} farms take part (the co-op&apos;s minimum), so that its
                report never shows one farm&apos;s figures.
              </p>
            </Notice>
          </div>
        ) : null}
        {trial.status === "open" || trial.status === "running" ? <EnrolmentShortfall trial={trial} readiness={readiness} /> : null}
        {moves.length === 0 ? (
          <p className="text-sm text-ink-soft">This trial is {trialStatusLabels[trial.status].toLowerCase()}; it does not move any more.</p>
        ) : null}
        <div className="space-y-3">
          {trial.status === "draft" ? (
            <ButtonLink href={`/trials/${trial.id}/edit`} variant="secondary">
              Edit the design
            </ButtonLink>
          ) : null}
          {moves.map((to) =>
            to === "collecting" && review ? (
              <ActionForm key={to} action={moveTrialAction} hidden={{ trialId: trial.id, to }} submitLabel={moveLabels[to]}>
                <label className="flex items-start gap-3 text-sm">
                  <input type="checkbox" name="reviewed" value={review.fingerprint} required className="mt-0.5 h-5 w-5 shrink-0" />
                  <span>
                    I have read what is still incomplete. Close the trial and analyse what is in: {count(review.totals.wouldCount, "block")}{" "}
                    compared, the rest left out and listed under &ldquo;Deviations from the plan&rdquo;.
                  </span>
                </label>
              </ActionForm>
            ) : to === "published" && trial.runs.length ? (
              <ActionForm
                key={to}
                action={moveTrialAction}
                hidden={{ trialId: trial.id, to }}
                submitLabel={moveLabels[to]}
                confirm="Publish the run you picked to every member and observer, and e-mail them? A published version cannot be changed; a correction is an amendment."
              >
                <RunChoice runs={trial.runs} display={display} />
              </ActionForm>
            ) : (
              <ActionForm
                key={to}
                action={moveTrialAction}
                hidden={{ trialId: trial.id, to }}
                submitLabel={moveLabels[to]}
                variant={to === "withdrawn" ? "danger" : "primary"}
                confirm={
                  to === "withdrawn"
                    ? "Withdraw this trial? It cannot be reopened."
                    : to === "published"
                      ? "Publish the results to every member and observer, and e-mail them?"
                      : undefined
                }
              />
            ),
          )}
        </div>
        {trial.status === "running" ? (
          <p className="mt-3 text-sm text-ink-soft">
            Closing the trial runs the pre-declared analysis on the records received so far and stops reminders. Read what is still
            incomplete first.
          </p>
        ) : null}
      </Card>
      <Card title="History">
        {history.length === 0 ? (
          <p className="text-sm text-ink-soft">Nothing recorded yet.</p>
        ) : (
          <ol className="space-y-2 text-sm" data-testid="trial-history">
            {history.map((event, index) => {
              const details = event.details as { from?: TrialStatus; to?: TrialStatus };
              // A move reads as its two states; anything else as the activity log's sentence, not its internal name.
              const what =
                event.action === "trial.status_changed" && details.to
                  ? `${trialStatusLabels[details.from!]} → ${trialStatusLabels[details.to]} · ${event.actorLabel}`
                  : describeAuditEvent(event).sentence;
              return (
                <li key={index}>
                  <time dateTime={event.occurredAt.toISOString()} className="text-ink-soft">
                    {formatDateTime(event.occurredAt, display)}
                  </time>{" "}
                  · {what}
                </li>
              );
            })}
          </ol>
        )}
      </Card>
    </>
  );
}

async function CoordinatorFollowing({ trial, member, display }: { trial: TrialView; member: Member; display: TimeDisplay }) {
  const [progress, invitable] = await Promise.all([
    listTrialProgress(member, trial),
    trial.status === "open" ? listInvitableFarms(member, trial.id) : Promise.resolve([]),
  ]);
  const flushHeaders = Array.from({ length: trial.outcomeFlushes }, (_, index) => `Flush ${index + 1}`);
  const canRemind = remindersRun(trial.status);
  return (
    <>
      {trial.status === "open" ? (
        <Card title="Invite farms">
          {invitable.length === 0 ? (
            <p className="text-sm text-ink-soft">Every active member farm has been invited.</p>
          ) : (
            <ActionForm action={inviteFarmsAction} hidden={{ trialId: trial.id }} submitLabel="Invite and e-mail their managers">
              <fieldset className="space-y-1">
                <legend className="mb-1 text-sm font-medium">Farms to invite</legend>
                {invitable.map((farm) => (
                  <label key={farm.id} className="flex min-h-11 items-center gap-3">
                    <input type="checkbox" name={`farm:${farm.id}`} className="h-5 w-5" />
                    {farm.name}
                  </label>
                ))}
              </fieldset>
            </ActionForm>
          )}
        </Card>
      ) : null}
      <Card title="Farms and their progress">
        <p className="mb-3 text-sm text-ink-soft">Counts of blocks only; no farm&apos;s weights are shown here.</p>
        {progress.length === 0 ? (
          <p className="text-sm text-ink-soft">No farm has been invited yet.</p>
        ) : (
          <ScrollFrame label="Farms and their progress">
            <table className="w-full min-w-[44rem] text-sm [&_td]:pr-3 [&_th]:pr-3" data-testid="progress-table">
              <thead>
                <tr className="text-left">
                  <th scope="col" className="py-2">
                    Farm
                  </th>
                  <th scope="col">Answer</th>
                  <th scope="col">Listed</th>
                  <th scope="col">Made</th>
                  <th scope="col">Fruiting</th>
                  {flushHeaders.map((header) => (
                    <th key={header} scope="col">
                      {header}
                    </th>
                  ))}
                  <th scope="col">Contaminated</th>
                  <th scope="col">Against the timeline</th>
                  <th scope="col">Last reminded</th>
                  <th scope="col">
                    <span className="sr-only">Reminder</span>
                  </th>
                </tr>
              </thead>
              <tbody>
                {progress.map((row) => (
                  <tr key={row.farmId} className="border-t border-oat-300 align-top">
                    <th scope="row" className="py-2 text-left font-medium">
                      {row.farmName}
                    </th>
                    <td>{answerLabels[row.status]}</td>
                    <td>{row.progress.blocksListed}</td>
                    <td>{row.progress.blocksMade}</td>
                    <td>{row.progress.fruiting}</td>
                    {row.progress.flushesRecorded.map((count, index) => (
                      <td key={index}>{count}</td>
                    ))}
                    <td>{row.progress.contaminated}</td>
                    <td data-testid="behind">{row.behind ? "Behind" : row.status === "accepted" ? "On time" : ""}</td>
                    <td data-testid="last-reminded">
                      {row.lastRemindedAt ? (
                        <time dateTime={row.lastRemindedAt.toISOString()}>{formatDateTime(row.lastRemindedAt, display)}</time>
                      ) : (
                        "Never"
                      )}
                    </td>
                    <td className="py-1">
                      {canRemind && row.behind ? (
                        row.remindersAllowed ? (
                          <ActionForm
                            action={sendReminderAction}
                            hidden={{ trialId: trial.id, farmId: row.farmId }}
                            submitLabel="Send a reminder"
                            variant="secondary"
                          />
                        ) : (
                          <span className="text-ink-soft">Asked for no reminders</span>
                        )
                      ) : null}
                    </td>
                  </tr>
                ))}
              </tbody>
            </table>
          </ScrollFrame>
        )}
        {progress.some((row) => row.behind) ? (
          <div className="mt-4">
            <h3 className="font-semibold">Behind the timeline</h3>
            <ul className="list-disc pl-5 text-sm" data-testid="behind-why">
              {progress
                .filter((row) => row.behind)
                .map((row) => (
                  <li key={row.farmId}>
                    {row.farmName}: {row.behindWhy.join("; ")}
                  </li>
                ))}
            </ul>
          </div>
        ) : null}
      </Card>
    </>
  );
}

async function FarmSection({ trial, member }: { trial: TrialView; member: Member }) {
  const enrolment = await getOwnEnrolment(member, trial.id);
  if (!enrolment) {
    if (trial.status !== "open") return null;
    if (!can(member.role, "trial:enrol"))
      return <Notice>Your farm has not been invited to this trial. Your farm manager can ask to join it here.</Notice>;
    return (
      <Card title="Take part in this trial">
        <p className="mb-3 text-sm">
          The trial is open for enrolment. Asking puts your farm on its list as an invitation would, and the coordinator sees it; you then
          say how many blocks per arm your farm will make.
        </p>
        <ActionForm action={askToJoinTrialAction} hidden={{ trialId: trial.id }} submitLabel="Ask to join this trial" />
      </Card>
    );
  }
  if (enrolment.status === "invited") {
    if (trial.status !== "open") return <Notice>Enrolment closed before your farm answered.</Notice>;
    if (!can(member.role, "trial:enrol")) return <Notice>Your farm is invited; your farm manager answers for the farm.</Notice>;
    if (trial.designKind === "rooms")
      return (
        <Card title="Your farm is invited">
          <p className="mb-3 text-sm">
            In this trial each arm is a climate regime run in whole fruiting rooms. Accepting commits your farm to run each room it picks
            under the regime its arm is drawn to, and Rhizomorph gives you a list of block codes for each room.
          </p>
          <RoomPickForm
            trialId={trial.id}
            arms={trial.arms.length}
            blocksPerRoom={trial.blocksPerRoom ?? null}
            rooms={await listRoomChoices(member)}
          />
          <div className="mt-4">
            <ActionForm
              action={respondToInvitationAction}
              hidden={{ trialId: trial.id, answer: "decline" }}
              submitLabel="Decline"
              variant="secondary"
              confirm="Decline this trial for your farm?"
            />
          </div>
        </Card>
      );
    return (
      <Card title="Your farm is invited">
        <p className="mb-3 text-sm">
          Accepting commits your farm to make the same number of blocks for every arm ({trial.arms.length} arms). Rhizomorph then gives you
          a randomised list of block codes to label your bags with.
        </p>
        <div className="flex flex-wrap items-end gap-6">
          <ActionForm
            action={respondToInvitationAction}
            hidden={{ trialId: trial.id, answer: "accept" }}
            submitLabel="Accept and make our list"
          >
            <div className="space-y-1">
              <label htmlFor="blocksPerArm" className="block text-sm font-medium">
                Blocks per arm
              </label>
              <input
                id="blocksPerArm"
                name="blocksPerArm"
                inputMode="numeric"
                defaultValue={String(suggestedBlocksPerArm(trial))}
                required
                className="block min-h-11 w-32 rounded-lg border border-oat-300 px-3 py-2"
              />
            </div>
          </ActionForm>
          <ActionForm
            action={respondToInvitationAction}
            hidden={{ trialId: trial.id, answer: "decline" }}
            submitLabel="Decline"
            variant="secondary"
            confirm="Decline this trial for your farm?"
          />
        </div>
      </Card>
    );
  }
  if (enrolment.status !== "accepted")
    return <Notice>Your farm is not taking part in this trial ({answerLabels[enrolment.status].toLowerCase()}).</Notice>;
  const progress = await getOwnProgress(member, trial);
  // Once the trial is closed nothing is due any more: no reminder comes, and later records are not in its analysis.
  const due = progress && remindersRun(trial.status) ? dueItems(progress) : [];
  const behind = progress && remindersRun(trial.status) ? behindReasons(timelineOf(trial), progress, todayUtc()) : [];
  return (
    <Card title="Your farm's part">
      <p className="text-sm">
        {trial.designKind === "rooms"
          ? "Your rooms were drawn to the arms, and each room's blocks listed with its arm."
          : `${enrolment.blocksPerArm === null ? "No number of blocks" : count(enrolment.blocksPerArm, "block")} per arm.`}{" "}
        Randomised from seed <code className="break-all font-mono text-xs">{enrolment.randomisationSeed}</code>, so the list can be checked.
        {enrolment.remindersAllowed ? "" : " You asked not to get reminders."}
      </p>
      {trial.designKind === "rooms" ? <RoomDrawTable draw={await listOwnRoomDraw(member, trial.id)} /> : null}
      <div className="my-4 flex flex-wrap gap-3">
        {can(member.role, "trial-list:download") ? (
          <>
            <ButtonLink href={`/trials/${trial.id}/labels`}>Label sheet</ButtonLink>
            <a
              href={`/api/trials/${trial.id}/list`}
              className="inline-flex min-h-11 items-center justify-center rounded-lg border border-moss-600 bg-white px-4 py-2 text-sm font-semibold text-moss-700 hover:bg-moss-50"
              download
            >
              Download the list as a season log (CSV)
            </a>
          </>
        ) : null}
      </div>
      {can(member.role, "trial-list:download") ? (
        <p className="mb-4 text-sm text-ink-soft">
          The list comes in the season-log format with each block&apos;s strain, trial, arm and fruiting method
          {trial.designKind === "rooms" ? " (and its fruiting room)" : ""} filled in: add dates and weights as you go and upload it on
          Season logs as it stands.
        </p>
      ) : null}
      {progress ? (
        <dl className="grid grid-cols-2 gap-2 text-sm sm:grid-cols-4" data-testid="own-progress">
          <div>
            <dt className="text-ink-soft">Listed</dt>
            <dd className="text-lg font-semibold">{progress.blocksListed}</dd>
          </div>
          <div>
            <dt className="text-ink-soft">In your season log</dt>
            <dd className="text-lg font-semibold">{progress.blocksMade}</dd>
          </div>
          <div>
            <dt className="text-ink-soft">Fruiting</dt>
            <dd className="text-lg font-semibold">{progress.fruiting}</dd>
          </div>
          <div>
            <dt className="text-ink-soft">Contaminated</dt>
            <dd className="text-lg font-semibold">{progress.contaminated}</dd>
          </div>
        </dl>
      ) : null}
      {behind.length ? (
        <div className="mt-4" data-testid="own-behind">
          <Notice tone="caution" title="Behind the trial's timeline">
            <p>{behind.join("; ")}.</p>
          </Notice>
        </div>
      ) : null}
      <h3 className="mt-4 font-semibold">Still due</h3>
      {due.length ? (
        <ul className="list-disc pl-5 text-sm">
          {due.map((item) => (
            <li key={item}>{item}</li>
          ))}
        </ul>
      ) : (
        <p className="text-sm text-ink-soft">
          {remindersRun(trial.status) || trial.status === "open" ? "Nothing due right now." : "Nothing due: the trial is closed."}
        </p>
      )}
      {progress && progress.contaminated > 0 ? (
        <div className="mt-4">
          <Caution which="spores" />
        </div>
      ) : null}
      <p className="mt-3 text-sm text-ink-soft">
        Upload your season log with these block codes and the blocks attach to the trial.{" "}
        <Link className="underline" href="/season-logs">
          Season logs
        </Link>
      </p>
    </Card>
  );
}

/** The design's sample-size figures, or null when the coordinator gave none. */
function planOf(trial: TrialView): SampleSizeInput | null {
  if (!trial.smallestDifference || !trial.expectedSd || !trial.plannedFarms) return null;
  return {
    difference: trial.smallestDifference,
    sd: trial.expectedSd,
    plannedFarms: trial.plannedFarms,
    expectedLoss: trial.expectedLoss ?? 0,
    arms: trial.arms.length,
    crossing: crossingOf(trial.designKind, trial.arms),
  };
}

/** Fewer farms or blocks than the plan needs: said while farms can still be invited, and once running. */
function EnrolmentShortfall({
  trial,
  readiness,
}: {
  trial: TrialView;
  readiness: { accepted: number; blocksPerArm: number; minimumFarms: number };
}) {
  // The co-op's minimum has its own notice above; before anyone accepts there is nothing to compare yet.
  const warnings = enrolmentWarnings(planOf(trial), {
    acceptedFarms: readiness.accepted,
    blocksPerArm: readiness.blocksPerArm,
    minimumFarms: readiness.minimumFarms,
  }).filter((warning) => warning.kind !== "below_minimum_farms");
  if (!warnings.length || readiness.accepted === 0) return null;
  return (
    <div className="mb-3" data-testid="enrolment-short">
      <Notice tone="caution" title="Short of the planned size">
        {warnings.map((warning) => (
          <p key={warning.kind}>{warning.message}</p>
        ))}
      </Notice>
    </div>
  );
}

/** What the coordinator's plan asks of each farm at 80 % power, or 6 when the plan has no figures. */
function suggestedBlocksPerArm(trial: TrialView): number {
  const plan = planOf(trial);
  if (!plan) return 6;
  const panel = trialSampleSize(plan);
  return panel.ok ? panel.rows[0].perFarmPerArm : 6;
}
