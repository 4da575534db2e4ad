"use client";

export interface ForestChartRow {
  label: string;
  estimate: number;
  lower: number;
  upper: number;
  own: boolean;
  pooled: boolean;
}

/** A forest-style chart: each row's difference with its 95 % interval, a line at no difference. */
export function ForestChart({
  title,
  rows,
  caption = "Difference in BE points against the reference strain; bars are 95 % intervals.",
}: {
  title: string;
  rows: ForestChartRow[];
  caption?: string;
}) {
  const low = Math.min(0, ...rows.map((row) => row.lower));
  const high = Math.max(0, ...rows.map((row) => row.upper));
  const pad = (high - low) * 0.08 || 1;
  const [min, max] = [low - pad, high + pad];
  const labelWidth = 150;
  const width = 560;
  const rowHeight = 30;
  const height = rows.length * rowHeight + 36;
  const x = (value: number) => labelWidth + ((value - min) / (max - min)) * (width - labelWidth - 16);
  const ticks = niceTicks(min, max);
  return (
    <figure className="max-w-2xl overflow-x-auto">
      <svg viewBox={`0 0 ${width} ${height}`} className="w-full min-w-[320px]" role="img" aria-label={title}>
        <line x1={x(0)} x2={x(0)} y1={4} y2={height - 28} stroke="#44544f" strokeDasharray="4 3" />
        {rows.map((row, index) => {
          const y = index * rowHeight + 18;
          const colour = row.pooled ? "#1b392f" : row.own ? "#7a4f2a" : "#2e5e4e";
          return (
            <g key={`${row.label}-${index}`} data-forest-row={row.pooled ? "pooled" : row.own ? "own" : "farm"}>
              <text x={0} y={y + 4} fontSize={13} fill="#1d2b27" fontWeight={row.pooled || row.own ? 600 : 400}>
                {row.label}
              </text>
              <line x1={x(row.lower)} x2={x(row.upper)} y1={y} y2={y} stroke={colour} strokeWidth={2} />
              {row.pooled ? (
                <polygon
                  points={`${x(row.lower)},${y} ${x(row.estimate)},${y - 7} ${x(row.upper)},${y} ${x(row.estimate)},${y + 7}`}
                  fill={colour}
                />
              ) : (
                <rect x={x(row.estimate) - 5} y={y - 5} width={10} height={10} fill={colour} />
              )}
              <title>{`${row.label}: ${row.estimate.toFixed(1)} (95 % interval ${row.lower.toFixed(1)} to ${row.upper.toFixed(1)})`}</title>
            </g>
          );
        })}
        {ticks.map((tick) => (
          <text key={tick} x={x(tick)} y={height - 10} fontSize={12} textAnchor="middle" fill="#44544f">
            {tick}
          </text>
        ))}
      </svg>
      <figcaption className="text-sm text-ink-soft">{caption}</figcaption>
    </figure>
  );
}

function niceTicks(min: number, max: number): number[] {
  const span = max - min;
  const step = [1, 2, 5, 10, 20, 50].find((candidate) => span / candidate <= 6) ?? 100;
  const ticks: number[] = [];
  for (let tick = Math.ceil(min / step) * step; tick <= max; tick += step) ticks.push(tick);
  return ticks;
}
