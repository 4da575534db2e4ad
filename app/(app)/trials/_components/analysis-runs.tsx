import Link from "next/link";
import { Card } from "@/components/ui/card";
import type { AnalysisRunView, TrialView } from "@/lib/data/trials";
import { formatDateTime, type TimeDisplay } from "@/lib/time/display";
import { amendmentReasonMinimum } from "@/lib/trials/versions";
import { amendAnalysisAction, runAnalysisAction } from "../actions";
import { ActionForm } from "@/components/forms/action-form";
import { count } from "@/lib/words";

function standing(run: AnalysisRunView): string {
  if (!run.publication) return "Not published";
  return run.publication.version === 1 ? "Published, version 1" : `Published, version ${run.publication.version} (amendment)`;
}

/**
 * The coordinator's runs of the analysis: every run kept with when, who and what it read, which one
 * the results page shows, and the buttons to run again and, after publication, to amend.
 */
export function AnalysisRunsCard({ trial, display }: { trial: TrialView; display: TimeDisplay }) {
  const when = (date: Date) => formatDateTime(date, display);
  const unpublished = trial.runs.filter((run) => !run.publication);
  return (
    <Card title="Runs of the analysis">
      <p className="mb-3 text-sm" data-testid="shown-run">
        {trial.shownRun
          ? `The results page shows run ${trial.shownRun.run}, made ${when(trial.shownRun.ranAt)}${trial.shownRun.publication ? `, published as version ${trial.shownRun.publication.version}` : ", not yet published"}.`
          : "The analysis has not run yet."}{" "}
        Members and observers see published versions only.
      </p>
      {trial.runs.length ? (
        <div className="overflow-x-auto" tabIndex={0} role="region" aria-label="Runs of the analysis">
          <table className="w-full min-w-[40rem] text-sm [&_td]:pr-3 [&_th]:pr-3" data-testid="analysis-runs">
            <caption className="mb-2 text-left text-ink-soft">
              Newest first. What each run read: farms with blocks in the trial, blocks, harvest records, and blocks compared or left out;
              the fingerprint changes whenever any value analysed changes.
            </caption>
            <thead>
              <tr className="text-left align-bottom">
                <th scope="col" className="py-2">
                  Run
                </th>
                <th scope="col">Made</th>
                <th scope="col">By</th>
                <th scope="col">Farms</th>
                <th scope="col">Blocks</th>
                <th scope="col">Harvest records</th>
                <th scope="col">Compared</th>
                <th scope="col">Left out</th>
                <th scope="col">Fingerprint</th>
                <th scope="col">Standing</th>
              </tr>
            </thead>
            <tbody>
              {trial.runs.map((run) => (
                <tr key={run.id} className="border-t border-oat-300 align-top" data-run={run.run}>
                  <th scope="row" className="py-2 text-left font-medium">
                    <Link className="underline" href={`/trials/${trial.id}/results?run=${run.run}`}>
                      Run {run.run}
                    </Link>
                    {run.id === trial.shownRun?.id ? " (shown)" : ""}
                  </th>
                  <td>{when(run.ranAt)}</td>
                  <td>{run.ranByName}</td>
                  {run.inputs ? (
                    <>
                      <td>{run.inputs.farms}</td>
                      <td>{run.inputs.blocks}</td>
                      <td>{run.inputs.harvests}</td>
                      <td>{run.inputs.compared}</td>
                      <td>{run.inputs.leftOut}</td>
                    </>
                  ) : (
                    <td colSpan={5} className="text-ink-soft">
                      not recorded (analysed before runs were kept)
                    </td>
                  )}
                  <td>
                    <code className="font-mono text-xs">{run.fingerprint?.slice(0, 12) ?? "–"}</code>
                  </td>
                  <td>
                    {standing(run)}
                    {run.publication?.reason ? <span className="block text-ink-soft">Reason: {run.publication.reason}</span> : null}
                  </td>
                </tr>
              ))}
            </tbody>
          </table>
        </div>
      ) : null}
      {trial.status === "collecting" || trial.status === "published" ? (
        <div className="mt-4 space-y-2">
          <ActionForm action={runAnalysisAction} hidden={{ trialId: trial.id }} submitLabel="Run the analysis again" variant="secondary" />
          <p className="text-sm text-ink-soft">
            Runs the pre-declared analysis on every record in now and keeps it as a new run; earlier runs stay as they were. Only you see a
            run until it is published.
          </p>
        </div>
      ) : null}
      {trial.status === "published" ? (
        <div className="mt-6 border-t border-oat-300 pt-4">
          <h3 className="mb-2 font-semibold">Amend the published results</h3>
          {unpublished.length === 0 ? (
            <p className="text-sm text-ink-soft">
              A correction is published as an amendment of a new run. Run the analysis again once the corrected records are in, then publish
              that run here with its reason.
            </p>
          ) : (
            <ActionForm
              action={amendAnalysisAction}
              hidden={{ trialId: trial.id }}
              submitLabel="Publish as an amendment"
              confirm="Publish this run as an amendment, above the version in force? Both stay readable, and neither can be changed afterwards."
            >
              <RunChoice runs={unpublished} display={display} />
              <div className="space-y-1">
                <label htmlFor="reason" className="block text-sm font-medium">
                  Why the published results are amended
                </label>
                <textarea
                  id="reason"
                  name="reason"
                  required
                  minLength={amendmentReasonMinimum}
                  maxLength={1000}
                  rows={3}
                  aria-describedby="reason-help"
                  className="block w-full rounded-lg border border-oat-300 px-3 py-2"
                />
                <p id="reason-help" className="text-sm text-ink-soft">
                  Shown above the original on the report, e.g. &ldquo;Three farms&apos; flush 2 records arrived after publication.&rdquo;
                  Both versions stay readable, so records must have changed on no farm or on at least the co-op&apos;s minimum number of
                  farms: otherwise comparing them would show those farms&apos; blocks.
                </p>
              </div>
            </ActionForm>
          )}
        </div>
      ) : null}
    </Card>
  );
}

/** Radio buttons for runs, the newest picked. */
export function RunChoice({ runs, display }: { runs: AnalysisRunView[]; display: TimeDisplay }) {
  const when = (date: Date) => formatDateTime(date, display);
  return (
    <fieldset className="space-y-1">
      <legend className="mb-1 text-sm font-medium">Which run</legend>
      {runs.map((run, index) => (
        <label key={run.id} className="flex min-h-11 items-center gap-3 text-sm">
          <input type="radio" name="analysisId" value={run.id} defaultChecked={index === 0} required className="h-5 w-5" />
          Run {run.run}, made {when(run.ranAt)}
          {run.inputs ? ` (${count(run.inputs.compared, "block")} compared)` : ""}
          {index === 0 ? ", the newest" : ""}
        </label>
      ))}
    </fieldset>
  );
}
