import { Card } from "@/components/ui/card";
import { Caution } from "@/components/ui/caution";
import type { TrialView } from "@/lib/data/trials";
import { formatDate, type DateStyle } from "@/lib/time/display";

/** The design as declared: arms, outcome, protocol and planned size. */
export function ProtocolSummary({ trial, dateStyle }: { trial: TrialView; dateStyle: DateStyle }) {
  const humidity = trial.arms.some((arm) => arm.treatmentKind === "humidity");
  return (
    <Card title="Protocol as declared">
      <dl className="grid grid-cols-1 gap-3 text-sm sm:grid-cols-2">
        <div>
          <dt className="text-ink-soft">Species</dt>
          <dd>{trial.speciesName}</dd>
        </div>
        <div>
          <dt className="text-ink-soft">Arms compare</dt>
          <dd data-testid="design-kind-summary">
            {trial.designKind === "strain_by_method"
              ? "Strains crossed with fruiting methods, one arm per combination: the report tests the method, the strain and whether the best method depends on the strain (farms as blocks)."
              : trial.designKind === "rooms"
                ? `Rooms randomised to climate regimes within each farm${trial.blocksPerRoom ? `, ${trial.blocksPerRoom} blocks a room` : ""}${trial.roomIcc !== null ? `, sized for an intraclass correlation of ${trial.roomIcc}` : ""}: every block of a room is in its room's arm, and the regimes are compared on room means with farms as blocks.`
                : "One thing at a time: each arm against the reference arm (farms as blocks)."}
          </dd>
        </div>
        <div>
          <dt className="text-ink-soft">Outcome</dt>
          <dd>
            Biological efficiency over flushes 1–{trial.outcomeFlushes}; contaminated blocks{" "}
            {trial.contaminatedHandling === "exclude" ? "left out" : "count as 0 %"}. Contamination rate by arm as a second outcome.
          </dd>
        </div>
        <div className="sm:col-span-2">
          <dt className="text-ink-soft">Blocks left out and listed</dt>
          <dd data-testid="block-rules">
            Unfinished blocks (not yet through flush {trial.outcomeFlushes} and not marked spent), lost blocks (no wet mass or moisture) and
            blocks without a harvest in flushes 1–{trial.outcomeFlushes}
            {trial.contaminatedHandling === "exclude" ? ", and contaminated blocks" : ""}. A block without a harvest counts as 0 % only when
            it is contaminated
            {trial.contaminatedHandling === "exclude" ? " and the protocol counts contaminated blocks as 0 %, which this one does not" : ""}
            .
          </dd>
        </div>
        {trial.enrolmentDeadline ? (
          <div>
            <dt className="text-ink-soft">Enrolment deadline</dt>
            <dd>{formatDate(trial.enrolmentDeadline, dateStyle)}</dd>
          </div>
        ) : null}
        {trial.smallestDifference && trial.expectedSd ? (
          <div>
            <dt className="text-ink-soft">Planned to detect</dt>
            <dd>
              {trial.smallestDifference} BE points with blocks varying by {trial.expectedSd}
              {trial.plannedFarms ? `, on ${trial.plannedFarms} farms` : ""}
              {trial.expectedLoss !== null ? `, ${Math.round(trial.expectedLoss * 100)} % loss expected` : ""}
            </dd>
          </div>
        ) : null}
      </dl>
      <table className="mt-4 w-full text-sm">
        <caption className="mb-1 text-left font-semibold">Arms</caption>
        <thead>
          <tr className="text-left">
            <th scope="col" className="py-1">
              Arm
            </th>
            <th scope="col">Strain</th>
            <th scope="col">Treatment</th>
          </tr>
        </thead>
        <tbody>
          {trial.arms.map((arm) => (
            <tr key={arm.id} className="border-t border-oat-300">
              <th scope="row" className="py-2 text-left">
                {arm.label}
                {arm.isReference ? " (reference)" : ""}
              </th>
              <td>
                {arm.strainCode} — {arm.strainName}
              </td>
              <td>{arm.treatmentName ?? "—"}</td>
            </tr>
          ))}
        </tbody>
      </table>
      {trial.protocolNotes ? <p className="mt-4 whitespace-pre-line text-sm">{trial.protocolNotes}</p> : null}
      {humidity ? (
        <div className="mt-4">
          <Caution which="humidifiers" />
        </div>
      ) : null}
    </Card>
  );
}
