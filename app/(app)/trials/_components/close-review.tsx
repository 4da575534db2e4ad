import { Card } from "@/components/ui/card";
import type { CloseReview } from "@/lib/data/trials";
import { hasIncomplete } from "@/lib/trials/outcome";
import { agree, count } from "@/lib/words";

/** What closing now would leave incomplete, per farm and arm: counts of blocks only, never a mass. */
export function CloseReviewCard({ review, outcomeFlushes }: { review: CloseReview; outcomeFlushes: number }) {
  const { totals } = review;
  return (
    <Card title="Before closing: what is still incomplete">
      <p className="mb-3 text-sm">
        Closing runs the pre-declared analysis (run 1); you can run it again as late records arrive, and publishing freezes the run you
        pick. If the trial closed now, <strong>{count(totals.wouldCount, "block")}</strong> would be compared and{" "}
        <strong>
          {count(totals.leftOut.unfinished + totals.leftOut.lost + totals.leftOut.no_harvest + totals.leftOut.contaminated, "block")}
        </strong>{" "}
        left out: {totals.leftOut.unfinished} unfinished (not yet through flush {outcomeFlushes} and not marked spent),{" "}
        {totals.leftOut.lost} lost (no wet mass or moisture), {totals.leftOut.no_harvest} without a harvest in flushes 1–{outcomeFlushes},{" "}
        {totals.leftOut.contaminated} contaminated. {count(totals.notInSeasonLog, "listed block")}{" "}
        {agree(totals.notInSeasonLog, "is", "are")} not in any season log yet.
      </p>
      <p className="mb-3 text-sm text-ink-soft">Counts of blocks only; no farm&apos;s weights are shown here.</p>
      <div className="overflow-x-auto" tabIndex={0} role="region" aria-label="Incomplete blocks by farm and arm">
        <table className="w-full min-w-[40rem] text-sm [&_td]:pr-3 [&_th]:pr-3" data-testid="close-review">
          <thead>
            <tr className="text-left align-bottom">
              <th scope="col" className="py-2">
                Farm
              </th>
              <th scope="col">Arm</th>
              <th scope="col">Not in a season log</th>
              <th scope="col">Not through flush {outcomeFlushes}</th>
              <th scope="col">No wet mass or moisture</th>
              <th scope="col">Not yet spent</th>
              <th scope="col">Would be compared</th>
            </tr>
          </thead>
          <tbody>
            {review.rows.map((row) => (
              <tr
                key={`${row.farmId}-${row.armLabel}`}
                className={`border-t border-oat-300 ${hasIncomplete(row.counts) ? "" : "text-ink-soft"}`}
                data-farm={row.farmName}
                data-arm={row.armLabel}
              >
                <th scope="row" className="py-2 text-left font-medium">
                  {row.farmName}
                </th>
                <td>{row.armLabel}</td>
                <td>{row.counts.notInSeasonLog}</td>
                <td>{row.counts.withoutOutcomeFlushes}</td>
                <td>{row.counts.withoutMass}</td>
                <td>{row.counts.notSpent}</td>
                <td>
                  {row.counts.wouldCount} of {row.counts.listed}
                </td>
              </tr>
            ))}
          </tbody>
        </table>
      </div>
      <p className="mt-3 text-sm text-ink-soft">
        A block through flush {outcomeFlushes} counts even if not yet spent; a block marked spent (its spent mass recorded) counts with the
        flushes it gave. Send a reminder to a farm that is behind, or wait for its season log, before you close.
      </p>
    </Card>
  );
}
