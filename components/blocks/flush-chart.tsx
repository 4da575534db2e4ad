import { BlockFlushLines } from "@/components/charts/block-flush-lines";
import { Card } from "@/components/ui/card";
import type { BlockDetail } from "@/lib/data/blocks";
import { getStrainFlushCurve } from "@/lib/data/pooled-results";
import { flushTrail } from "@/lib/season-logs/flush-trail";
import { GRAMS_PER_POUND, type MassDisplay } from "@/lib/units";

/**
 * A block's flushes as a small chart over time, beside its strain's share of yield by flush from the
 * co-op's newest release (or the one line saying why that curve is withheld). Nothing without a harvest.
 */
export async function FlushChart({ block, display }: { block: BlockDetail; display: MassDisplay }) {
  if (block.harvests.length === 0) return null;
  const curve = await getStrainFlushCurve(block.strainId);
  const trail = flushTrail(block, block.harvests);
  const byDay = trail.every((point) => point.day !== null);
  const byEfficiency = trail.every((point) => point.cumulativeEfficiency !== null);
  const massUnit = display === "imperial" ? { name: "lb", grams: GRAMS_PER_POUND } : { name: "g", grams: 1 };
  const overTime = trail.map((point) => ({
    x: byDay ? (point.day ?? 0) : point.flush,
    y: byEfficiency ? Math.round((point.cumulativeEfficiency ?? 0) * 10) / 10 : point.cumulativeFreshG / massUnit.grams,
    flush: point.flush,
  }));
  const last = trail[trail.length - 1];
  // A block still fruiting may give another flush, so its shares so far are not comparable with finished blocks'.
  const spent = block.state === "spent";
  const coopShares =
    curve.status === "published" ? curve.shares.map((share) => ({ flush: share.flush, percent: Math.round(share.meanShare * 100) })) : null;
  const coopByLastFlush = coopShares?.filter((share) => share.flush <= last.flush).reduce((sum, share) => sum + share.percent, 0);
  return (
    <Card title="Flushes over time">
      <BlockFlushLines
        blockCode={block.code}
        strainName={block.strainName}
        overTime={overTime}
        overTimeAxis={{
          x: byDay ? "Days since inoculation" : "Flush",
          y: byEfficiency ? "BE so far (%)" : `Fresh so far (${massUnit.name})`,
        }}
        coopShares={coopShares}
        ownShares={spent ? trail.map((point) => ({ flush: point.flush, percent: Math.round((point.share ?? 0) * 100) })) : null}
      />
      <div className="mt-3 space-y-1 text-sm">
        <p>
          {last.cumulativeEfficiency === null
            ? `By flush ${last.flush} the block had given its fruit; its BE needs the wet block mass and the moisture.`
            : `By flush ${last.flush}${last.day === null ? "" : ` (day ${last.day})`} the block had given ${last.cumulativeEfficiency.toFixed(1)} % BE.`}
          {byDay ? "" : " Days are left out: the inoculation date or a harvest date is missing."}
        </p>
        {curve.status === "published" ? (
          <p className="text-ink-soft">
            Co-op line: the mean share of yield by flush of every member farm&apos;s finished blocks of {block.strainName} (any recipe and
            fruiting method), release {curve.releaseNumber}, as in Co-op results.
            {coopByLastFlush === undefined || coopByLastFlush >= 100
              ? ""
              : ` By flush ${last.flush} those blocks had given ${coopByLastFlush} % of their yield.`}
          </p>
        ) : (
          <p className="text-ink-soft" data-testid="coop-curve-withheld">
            {curve.message}
          </p>
        )}
        {spent ? null : (
          <p className="text-ink-soft">
            This block&apos;s own shares appear once its spent mass is weighed: until then its last flush may not be its last.
          </p>
        )}
      </div>
    </Card>
  );
}
