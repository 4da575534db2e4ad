import type { Description } from "@/lib/stats";
import { ForestChart } from "@/components/charts/forest-chart";
import type { PooledDifference } from "@/lib/trials/analysis";

const fmt = (value: number) => value.toFixed(1);

/** Boxplot of the outcome by arm: box from the first to the third quartile, line at the median, whiskers to min and max. */
export function ArmBoxplot({ arms }: { arms: { label: string; summary: Description | null }[] }) {
  const shown = arms.filter((arm): arm is { label: string; summary: Description } => arm.summary !== null);
  if (!shown.length) return <p className="text-sm text-ink-soft">Too few blocks to draw.</p>;
  const low = Math.min(...shown.map((arm) => arm.summary.min));
  const high = Math.max(...shown.map((arm) => arm.summary.max));
  const pad = (high - low) * 0.08 || 1;
  const [from, to] = [Math.max(0, low - pad), high + pad];
  const width = 560;
  const rowHeight = 48;
  const left = 80;
  const x = (value: number) => left + ((value - from) / (to - from)) * (width - left - 20);
  const height = shown.length * rowHeight + 40;
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
          const s = arm.summary;
          return (
            <g key={arm.label}>
              <text x={8} y={y + 20} className="fill-ink text-[13px]">
                Arm {arm.label}
              </text>
              <line x1={x(s.min)} x2={x(s.max)} y1={y + 16} y2={y + 16} stroke="#44544f" />
              <rect x={x(s.q1)} y={y + 4} width={Math.max(1, x(s.q3) - x(s.q1))} height={24} fill="#dce9e3" stroke="#244b3e" />
              <line x1={x(s.median)} x2={x(s.median)} y1={y + 4} y2={y + 28} stroke="#1b392f" strokeWidth={3} />
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
          .map(
            (arm) => `Arm ${arm.label}: median ${fmt(arm.summary.median)} %, middle half ${fmt(arm.summary.q1)}–${fmt(arm.summary.q3)} %`,
          )
          .join("; ")}
        .
      </figcaption>
    </figure>
  );
}

/** Each farm's difference against the reference arm with its 95 % interval, and the pooled estimate. */
export function TrialForestChart({ pooling, reference }: { pooling: PooledDifference; reference: string }) {
  const rows = [
    ...pooling.farms.map((farm) => ({
      label: farm.farm,
      estimate: farm.estimate,
      lower: farm.lower,
      upper: farm.upper,
      own: false,
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
