import { ForestChart } from "@/components/charts/forest-chart";
import type { Spread } from "@/lib/pooled";
import type { PublishedArm, PublishedPooledDifference } from "@/lib/trials/report";

const fmt = (value: number) => value.toFixed(1);

/**
 * Boxplot of the outcome by arm: box from the 25th to the 75th percentile, line at the median,
 * whiskers to the 10th and 90th. Each percentile is published only with three blocks at or beyond
 * it (lib/trials/report.ts), so no single block's value is drawn; a whisker without enough blocks is left out.
 */
export function ArmBoxplot({ arms }: { arms: PublishedArm[] }) {
  const shown = arms.filter((arm): arm is PublishedArm & { spread: Spread } => arm.spread !== null);
  if (!shown.length) return <p className="text-sm text-ink-soft">Too few blocks per arm to draw a spread without showing single blocks.</p>;
  const ends = shown.flatMap((arm) => [arm.spread[0] ?? arm.spread[1], arm.spread[4] ?? arm.spread[3]]);
  const low = Math.min(...ends);
  const high = Math.max(...ends);
  const pad = (high - low) * 0.08 || 1;
  const [from, to] = [Math.max(0, low - pad), high + pad];
  const width = 560;
  const rowHeight = 48;
  const left = 80;
  const x = (value: number) => left + ((value - from) / (to - from)) * (width - left - 20);
  const height = shown.length * rowHeight + 40;
  const withoutWhiskers = shown.filter((arm) => arm.spread[0] === null || arm.spread[4] === null);
  return (
    <figure className="overflow-x-auto" tabIndex={0}>
      <svg
        viewBox={`0 0 ${width} ${height}`}
        className="h-auto w-full min-w-[30rem]"
        role="img"
        aria-label="Biological efficiency by arm, boxplot"
      >
        {shown.map((arm, index) => {
          const y = 20 + index * rowHeight;
          const [p10, q1, median, q3, p90] = arm.spread;
          return (
            <g key={arm.label}>
              <text x={8} y={y + 20} className="fill-ink text-[13px]">
                Arm {arm.label}
              </text>
              {p10 !== null ? <line x1={x(p10)} x2={x(q1)} y1={y + 16} y2={y + 16} stroke="#44544f" /> : null}
              {p90 !== null ? <line x1={x(q3)} x2={x(p90)} y1={y + 16} y2={y + 16} stroke="#44544f" /> : null}
              <rect x={x(q1)} y={y + 4} width={Math.max(1, x(q3) - x(q1))} height={24} fill="#dce9e3" stroke="#244b3e" />
              <line x1={x(median)} x2={x(median)} y1={y + 4} y2={y + 28} stroke="#1b392f" strokeWidth={3} />
            </g>
          );
        })}
        <line x1={left} x2={width - 20} y1={height - 18} y2={height - 18} stroke="#44544f" />
        {[from, (from + to) / 2, to].map((tick) => (
          <text key={tick} x={x(tick)} y={height - 4} textAnchor="middle" className="fill-ink-soft text-[11px]">
            {fmt(tick)} %
          </text>
        ))}
      </svg>
      <figcaption className="text-sm text-ink-soft">
        {shown
          .map((arm) => `Arm ${arm.label}: median ${fmt(arm.spread[2])} %, middle half ${fmt(arm.spread[1])}–${fmt(arm.spread[3])} %`)
          .join("; ")}
        . Whiskers: 10th to 90th percentile.
        {withoutWhiskers.length
          ? ` No whiskers for arm ${withoutWhiskers.map((arm) => arm.label).join(", ")}: fewer than 21 blocks, so a whisker would sit on a single block.`
          : ""}
      </figcaption>
    </figure>
  );
}

/** Each farm's difference against the reference arm with its 95 % interval, and the pooled estimate. */
export function TrialForestChart({ pooling, reference }: { pooling: PublishedPooledDifference; reference: string }) {
  const rows = [
    ...pooling.farms.map((farm) => ({
      label: farm.own && farm.farm !== "Your farm" ? `${farm.farm} (your farm)` : farm.farm,
      estimate: farm.estimate,
      lower: farm.lower,
      upper: farm.upper,
      own: farm.own ?? false,
      pooled: false,
    })),
    ...(pooling.pooled
      ? [
          {
            label: "All farms",
            estimate: pooling.pooled.estimate,
            lower: pooling.pooled.lower,
            upper: pooling.pooled.upper,
            own: false,
            pooled: true,
          },
        ]
      : []),
  ];
  if (!rows.length) return <p className="text-sm text-ink-soft">{pooling.note ?? "No farm ran both arms."}</p>;
  const pooled = pooling.pooled
    ? ` Pooled across farms (random effects): ${fmt(pooling.pooled.estimate)} (${fmt(pooling.pooled.lower)} to ${fmt(pooling.pooled.upper)}); farms differ by I² = ${Math.round(pooling.pooled.i2)} %.`
    : ` ${pooling.note ?? ""}`;
  return (
    <ForestChart
      title={`Arm ${pooling.arm} minus arm ${reference}, by farm`}
      rows={rows}
      caption={`Arm ${pooling.arm} minus reference arm ${reference}, BE points, with 95 % intervals.${pooled}`}
    />
  );
}
