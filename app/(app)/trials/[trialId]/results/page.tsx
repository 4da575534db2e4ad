import type { Metadata } from "next";
import { trialOrNotFound } from "../../_components/trial-or-not-found";
import { Card } from "@/components/ui/card";
import { Caution } from "@/components/ui/caution";
import { Notice } from "@/components/ui/notice";
import { PageHeader } from "@/components/ui/page-header";
import { requirePage } from "@/lib/auth/guard";
import { can } from "@/lib/auth/permissions";
import Link from "next/link";
import { notFound } from "next/navigation";
import type { PublishedVersion, StoredResults, TrialView } from "@/lib/data/trials";
import type { Difference } from "@/lib/trials/analysis";
import { formatDateTime, formatDay, type TimeDisplay } from "@/lib/time/display";
import { timeDisplayFor } from "@/lib/time/member-display";
import { amendmentLine } from "@/lib/trials/versions";
import { exclusionReasonLabel, exclusionReasons } from "@/lib/trials/outcome";
import type { ArmDeviation, PlannedAndAchieved } from "@/lib/trials/report";
import { PrintButton } from "../../_components/print-button";
import { ProtocolSummary } from "../../_components/protocol-summary";
import { StatusBadge } from "../../_components/status-badge";
import { ArmBoxplot, TrialForestChart } from "../../_components/trial-charts";
import { DifferenceRow, FactorialResults } from "../../_components/factorial-results";
import { RoomResults } from "../../_components/room-results";
import { agree, count } from "@/lib/words";

export const metadata: Metadata = { title: "Trial results" };

const fmt = (value: number, digits = 1) => value.toFixed(digits);
const pText = (p: number) => (p < 0.001 ? "< 0.001" : fmt(p, 3));

export default async function TrialResultsPage({
  params,
  searchParams,
}: {
  params: Promise<{ trialId: string }>;
  searchParams: Promise<{ run?: string }>;
}) {
  const member = await requirePage("trial:read");
  const { trialId } = await params;
  const { run } = await searchParams;
  // A run other than the one in force is for the coordinator; for anyone else getTrial offers published runs only.
  const trial = await trialOrNotFound(member, trialId, { run: run && /^\d{1,4}$/.test(run) ? Number(run) : undefined });
  const display = await timeDisplayFor(member);
  const day = (date: Date) => formatDay(date, display);
  const coordinator = can(member.role, "trial:manage");
  if (trial.status !== "published" && !(coordinator && trial.status === "collecting")) {
    notFound();
  }
  const results = trial.results;
  const shownVersion = trial.versions.find((version) => version.run.id === trial.shownRun?.id) ?? null;
  // Below a published version: the versions it replaced, newest first, each readable as it was published.
  const earlier = shownVersion ? trial.versions.filter((version) => version.version < shownVersion.version) : [];
  return (
    <>
      {/* Printed as a report, without the menu (app/globals.css). */}
      <span data-print="report" hidden />
      <PageHeader title={`Results — ${trial.title}`} lead={trial.question}>
        <span className="no-print flex flex-wrap gap-3">
          <PrintButton label="Print the report" />
          {trial.status === "published" && results ? (
            <>
              <a
                href={`/api/trials/${trial.id}/report/pdf`}
                className="inline-flex min-h-11 items-center justify-center rounded-lg border border-moss-600 bg-white px-4 py-2 text-sm font-semibold text-moss-700 hover:bg-moss-50"
                download
              >
                Download the report (PDF)
              </a>
              <a
                href={`/api/trials/${trial.id}/report/csv`}
                className="inline-flex min-h-11 items-center justify-center rounded-lg border border-moss-600 bg-white px-4 py-2 text-sm font-semibold text-moss-700 hover:bg-moss-50"
                download
              >
                Its tables (CSV)
              </a>
            </>
          ) : null}
        </span>
      </PageHeader>
      <div className="mb-6 flex flex-wrap items-center gap-3">
        <span className="font-mono text-sm text-ink-soft">{trial.code}</span>
        <StatusBadge status={trial.status} />
        {trial.publishedAt ? <span className="text-sm text-ink-soft">published {day(trial.publishedAt)}</span> : null}
      </div>
      {trial.shownRun && !trial.shownRun.publication ? (
        <div className="no-print mb-6" data-testid="unpublished-run">
          <Notice tone="caution">
            Run {trial.shownRun.run} of the analysis, made {formatDateTime(trial.shownRun.ranAt, display)}. Only you can see it until you
            publish it from the trial page.
          </Notice>
        </div>
      ) : shownVersion ? (
        <p className="mb-6 text-sm text-ink-soft" data-testid="shown-version">
          Version {shownVersion.version} of this report{shownVersion.version > 1 ? " (an amendment)" : ""}, published{" "}
          {day(shownVersion.publishedAt)}: run {shownVersion.run.run} of the analysis, made {day(shownVersion.run.ranAt)}.
          {shownVersion.version < trial.versions[0].version ? (
            <strong className="ml-1">
              Version {trial.versions[0].version} replaces it:{" "}
              <Link className="underline" href={`/trials/${trial.id}/results`}>
                read the version in force
              </Link>
              .
            </strong>
          ) : null}
        </p>
      ) : null}
      {!results ? (
        <Notice>The analysis has not run yet.</Notice>
      ) : (
        <div className="space-y-10">
          {shownVersion && shownVersion.version > 1 ? (
            <AmendmentNotice version={shownVersion} before={earlier[0]} display={display} />
          ) : null}
          <section
            aria-label={shownVersion ? `Version ${shownVersion.version}` : `Run ${trial.shownRun?.run ?? ""}`}
            data-testid="report-version"
          >
            <Report trial={trial} results={results} display={display} />
          </section>
          {earlier.map((version, index) => (
            <section
              key={version.version}
              aria-label={`Version ${version.version}`}
              data-testid="report-version"
              className="border-t-4 border-oat-300 pt-6"
            >
              <h2 className="mb-1 text-xl font-semibold">
                {version.version === 1 ? "The original analysis" : `Version ${version.version}`}, published {day(version.publishedAt)}
              </h2>
              <p className="mb-4 text-sm text-ink-soft">
                {earlier[index + 1] ? <AmendmentLine version={version} before={earlier[index + 1]} display={display} /> : null}
                Kept as it was published; the version above replaces it.
              </p>
              <Report trial={trial} results={version.results} display={display} />
            </section>
          ))}
          <ProtocolSummary trial={trial} dateStyle={display.dateStyle} />
        </div>
      )}
    </>
  );
}

/** "Amended on …: reason. The original analysis of … is below." */
function AmendmentLine(props: { version: PublishedVersion; before: PublishedVersion | undefined; display: TimeDisplay }) {
  const { version, before, display } = props;
  return <>{amendmentLine(version, before ? { version: before.version, ranAt: before.run.ranAt } : null, display)} </>;
}

function AmendmentNotice(props: { version: PublishedVersion; before: PublishedVersion | undefined; display: TimeDisplay }) {
  const { version, before, display } = props;
  return (
    <div data-testid="amendment-notice">
      <Notice tone="caution" title={`Version ${version.version}: an amendment`}>
        <p>
          <AmendmentLine version={version} before={before} display={display} />
        </p>
      </Notice>
    </div>
  );
}

function Report({ trial, results, display }: { trial: TrialView; results: StoredResults; display: TimeDisplay }) {
  return (
    <div className="space-y-6">
      <Card title="The answer">
        <p className="text-lg" data-testid="trial-answer">
          {results.analysis.answer}
        </p>
        <p className="mt-2 text-sm text-ink-soft">
          {results.analysis.blocksAnalysed === null
            ? `Fewer than ${results.analysis.minimumFarms} farms reported, so no figure of this trial is published.`
            : `${count(results.analysis.blocksAnalysed, "block")} from ${count(results.analysis.farmsContributing, "farm")} ${agree(results.analysis.blocksAnalysed, "was", "were")} analysed.`}{" "}
          Intervals are 95 %.{" "}
          {results.analysis.differencesFrom === "arm + farm"
            ? "Differences are between farm-adjusted means (each farm counts as a block) and are adjusted for comparing every pair of arms (Tukey)."
            : "Differences in this analysis compare the pooled blocks of each arm without taking farms into account (one-way Tukey–Kramer); analyse again for farm-adjusted differences."}
        </p>
        {results.analysis.notes.map((note) => (
          <p key={note} className="mt-2 text-sm">
            {note}
          </p>
        ))}
      </Card>

      {results.factorial?.anova ? <FactorialResults factorial={results.factorial} /> : null}
      {results.rooms ? <RoomResults rooms={results.rooms} referenceArm={results.analysis.referenceArm} /> : null}

      {results.analysis.anova ? (
        <Card title="Biological efficiency by arm, adjusted for farm">
          {results.analysis.arms.some((arm) => arm.withheld) ? (
            <p className="mb-2 text-sm text-ink-soft">
              Arms run on fewer than {results.analysis.minimumFarms} farms are left out of every table and chart.
            </p>
          ) : null}
          <table className="w-full text-sm [&_td]:pr-3 [&_th]:pr-3">
            <thead>
              <tr className="text-left">
                <th scope="col" className="py-1">
                  Arm
                </th>
                <th scope="col">Blocks</th>
                <th scope="col">Adjusted mean BE</th>
                <th scope="col">95 % interval</th>
              </tr>
            </thead>
            <tbody>
              {results.analysis.anova.adjustedMeans.map((mean) => (
                <tr key={mean.treatment} className="border-t border-oat-300">
                  <th scope="row" className="py-2 text-left">
                    {mean.treatment}
                    {mean.treatment === results.analysis.referenceArm ? " (reference)" : ""}
                  </th>
                  <td>{results.analysis.arms.find((arm) => arm.label === mean.treatment)?.n ?? "–"}</td>
                  <td>{fmt(mean.estimate)} %</td>
                  <td>
                    {fmt(mean.lower)} – {fmt(mean.upper)} %
                  </td>
                </tr>
              ))}
            </tbody>
          </table>
          <p className="mt-2 text-sm text-ink-soft">
            Do the arms differ, once farms are allowed for? F = {fmt(results.analysis.anova.arm.f, 2)} on {results.analysis.anova.arm.df}{" "}
            degrees of freedom, p {pText(results.analysis.anova.arm.p)}. Do farms differ? p {pText(results.analysis.anova.farm.p)}.
          </p>
          <div className="mt-4">
            <ArmBoxplot arms={results.analysis.arms} />
          </div>
        </Card>
      ) : null}

      {results.analysis.versusReference.length ? (
        <Card title="Differences between arms">
          <DifferenceTable
            rows={[...results.analysis.versusReference, ...results.analysis.betweenArms]}
            farmAdjusted={results.analysis.differencesFrom === "arm + farm"}
          />
        </Card>
      ) : null}

      {results.analysis.farmPooling.length ? (
        <Card title="Farm by farm">
          <div className="space-y-6">
            {results.analysis.farmPooling.map((pooling) => (
              <TrialForestChart key={pooling.arm} pooling={pooling} reference={results.analysis.referenceArm} />
            ))}
          </div>
          <div className="mt-4">
            <Caution which="pooledFigures" />
          </div>
        </Card>
      ) : null}

      <Card title="Contamination by arm">
        <table className="w-full text-sm [&_td]:pr-3 [&_th]:pr-3">
          <thead>
            <tr className="text-left">
              <th scope="col" className="py-1">
                Arm
              </th>
              <th scope="col">Contaminated</th>
              <th scope="col">Rate</th>
              <th scope="col">95 % interval (Wilson)</th>
            </tr>
          </thead>
          <tbody>
            {results.analysis.arms.map(({ label, contamination }) => (
              <tr key={label} className="border-t border-oat-300">
                <th scope="row" className="py-2 text-left">
                  {label}
                </th>
                {contamination ? (
                  <>
                    <td>
                      {contamination.contaminated} of {contamination.blocks}
                    </td>
                    <td>{fmt(contamination.p * 100)} %</td>
                    <td>
                      {fmt(contamination.lower * 100)} – {fmt(contamination.upper * 100)} %
                    </td>
                  </>
                ) : (
                  <td colSpan={3} className="text-ink-soft">
                    {`fewer than ${results.analysis.minimumFarms} farms ran this arm`}
                  </td>
                )}
              </tr>
            ))}
          </tbody>
        </table>
        <div className="mt-4">
          <Caution which="spores" />
        </div>
      </Card>

      <Card title="Deviations from the plan">
        <ul className="list-disc space-y-1 pl-5 text-sm">
          <li>
            {count(results.deviations.farmsDropped, "invited farm")} dropped out or never answered; {results.deviations.farmsDeclined}{" "}
            declined.
          </li>
          {results.deviations.plan ? <PlannedAndAchievedItem plan={results.deviations.plan} /> : null}
          {results.deviations.blocksMade !== null && results.deviations.blocksLeftOut !== null ? (
            <>
              <li>
                {results.deviations.blocksMade} of {results.deviations.blocksAssigned} listed blocks reached a season log.
              </li>
              <li>
                {count(results.deviations.blocksLeftOut, "block")} {agree(results.deviations.blocksLeftOut, "was", "were")} left out of the
                BE comparison
                {results.deviations.byArm
                  ? ", by reason and arm below."
                  : " (contaminated, as declared, or without a wet mass or moisture)."}
              </li>
            </>
          ) : (
            <li>Block counts are not published: fewer than {results.analysis.minimumFarms} farms reported.</li>
          )}
          {trial.withdrawalsAfterPublication > 0 ? (
            <li data-testid="withdrawal-note">
              {trial.withdrawalsAfterPublication === 1 ? "One farm" : `${trial.withdrawalsAfterPublication} farms`} withdrew their data from
              the co-op after these results were published. The figures above stay as they were published.
            </li>
          ) : null}
        </ul>
        {results.deviations.byArm && results.deviations.blocksMade !== null ? (
          <ArmDeviationTable rows={results.deviations.byArm} flushes={trial.outcomeFlushes} minimumFarms={results.analysis.minimumFarms} />
        ) : null}
      </Card>

      <p className="text-xs text-ink-soft">
        Analysed {formatDateTime(results.analysedAt, display)}.{" "}
        {results.analysis.perFarmRows
          ? "Farms appear only under names drawn at random for this trial; only your own farm is marked, and only for you."
          : "The farm-by-farm charts show the pooled estimate and, for a farm taking part, its own farm only."}
      </p>
    </div>
  );
}

function DifferenceTable({ rows, farmAdjusted }: { rows: Difference[]; farmAdjusted: boolean }) {
  const arms = new Set(rows.flatMap((row) => [row.arm, row.versus])).size;
  return (
    <>
      <table className="w-full text-sm [&_td]:pr-3 [&_th]:pr-3">
        <caption className="mb-2 text-left text-ink-soft">
          {farmAdjusted
            ? `Difference between two arms' farm-adjusted mean BE (the adjusted means above), from the model BE ~ arm + farm. Intervals and p-values allow for comparing all ${(arms * (arms - 1)) / 2} pairs of arms (Tukey).`
            : "Difference between two arms' mean BE over the pooled blocks, farms not taken into account (one-way Tukey–Kramer), as this analysis was made."}
        </caption>
        <thead>
          <tr className="text-left">
            <th scope="col" className="py-1">
              Comparison
            </th>
            <th scope="col">{farmAdjusted ? "Difference in farm-adjusted mean BE (points)" : "Difference in mean BE (points)"}</th>
            <th scope="col">95 % interval (Tukey)</th>
            <th scope="col">p, adjusted for all pairs (Tukey)</th>
          </tr>
        </thead>
        <tbody>
          {rows.map((row) => (
            <DifferenceRow key={`${row.arm}-${row.versus}`} label={`${row.arm} − ${row.versus}`} difference={row} bold />
          ))}
        </tbody>
      </table>
    </>
  );
}

function PlannedAndAchievedItem({ plan }: { plan: PlannedAndAchieved }) {
  return (
    <li data-testid="planned-achieved">
      Planned: {plan.farmsPlanned === null ? "no number of farms given" : count(plan.farmsPlanned, "farm")}
      {plan.blocksPerArmNeeded !== null
        ? `, ${plan.blocksPerArmNeeded} blocks per arm compared for 80 % power (${plan.blocksPerArmToMake} to make, allowing for the expected loss)`
        : ", no sample size calculated"}
      . Achieved: {count(plan.farmsTakingPart, "farm")} taking part
      {plan.farmsContributing !== null ? `, ${plan.farmsContributing} with blocks compared` : ""}; the blocks compared per arm are in the
      table below.
    </li>
  );
}

function ArmDeviationTable({ rows, flushes, minimumFarms }: { rows: ArmDeviation[]; flushes: number; minimumFarms: number }) {
  return (
    <div className="mt-4 overflow-x-auto" tabIndex={0} role="region" aria-label="Blocks left out, by arm">
      <table className="w-full min-w-[40rem] text-sm [&_td]:pr-3 [&_th]:pr-3" data-testid="deviations-by-arm">
        <caption className="mb-2 text-left text-ink-soft">
          Blocks per arm: listed by the randomisation, in a season log, compared (the achieved sample size), and left out, by reason.
        </caption>
        <thead>
          <tr className="text-left align-bottom">
            <th scope="col" className="py-1">
              Arm
            </th>
            <th scope="col">Listed</th>
            <th scope="col">In a season log</th>
            <th scope="col">Compared</th>
            {exclusionReasons.map((reason) => (
              <th key={reason} scope="col">
                Left out: {exclusionReasonLabel(reason, flushes)}
              </th>
            ))}
          </tr>
        </thead>
        <tbody>
          {rows.map(({ label, counts }) => (
            <tr key={label} className="border-t border-oat-300" data-arm={label}>
              <th scope="row" className="py-2 text-left">
                {label}
              </th>
              {counts ? (
                <>
                  <td>{counts.listed}</td>
                  <td>{counts.inSeasonLog}</td>
                  <td>
                    {counts.analysed}
                    {counts.countedAsZero ? ` (${counts.countedAsZero} contaminated, at 0 %)` : ""}
                  </td>
                  {exclusionReasons.map((reason) => (
                    <td key={reason}>{counts.leftOut[reason]}</td>
                  ))}
                </>
              ) : (
                <td colSpan={3 + exclusionReasons.length} className="text-ink-soft">
                  {`fewer than ${minimumFarms} farms ran this arm`}
                </td>
              )}
            </tr>
          ))}
        </tbody>
      </table>
    </div>
  );
}
