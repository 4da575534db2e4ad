"use client";

export interface FlushCurveSeries {
  name: string;
  /** Share of a block's yield picked up to each flush, 0–1, flush 1 first. */
  cumulative: number[];
  colour?: string;
}

/** Cumulative share of a block's yield by flush, one line per series. */
export function FlushCurve({ title, series }: { title: string; series: FlushCurveSeries[] }) {
  const flushes = Math.max(1, ...series.map((line) => line.cumulative.length));
  const width = 480;
  const height = 220;
  const left = 44;
  const bottom = 32;
  const x = (flush: number) => left + (flushes === 1 ? 0.5 : (flush - 1) / (flushes - 1)) * (width - left - 40);
  const y = (share: number) => 8 + (1 - share) * (height - bottom - 8);
  const palette = ["#2e5e4e", "#7a4f2a", "#6b4500", "#1b392f", "#8f2a1f"];
  return (
    <figure>
      <svg viewBox={`0 0 ${width} ${height}`} className="w-full" role="img" aria-label={title}>
        {[0, 0.25, 0.5, 0.75, 1].map((share) => (
          <g key={share}>
            <line x1={left} x2={width - 16} y1={y(share)} y2={y(share)} stroke="#ebe7dc" />
            <text x={left - 6} y={y(share) + 4} fontSize={11} textAnchor="end" fill="#44544f">{`${share * 100}%`}</text>
          </g>
        ))}
        {Array.from({ length: flushes }, (_, index) => (
          <text key={index} x={x(index + 1)} y={height - 10} fontSize={11} textAnchor="middle" fill="#44544f">{`Flush ${index + 1}`}</text>
        ))}
        {series.map((line, index) => (
          <polyline
            key={line.name}
            points={line.cumulative.map((share, flush) => `${x(flush + 1)},${y(share)}`).join(" ")}
            fill="none"
            stroke={line.colour ?? palette[index % palette.length]}
            strokeWidth={2.5}
          />
        ))}
      </svg>
      <figcaption className="flex flex-wrap gap-3 text-sm text-ink-soft">
        {series.map((line, index) => (
          <span key={line.name} className="inline-flex items-center gap-1">
            {/* An SVG swatch, not a style attribute: the Content Security Policy allows no inline styles. */}
            <svg aria-hidden="true" className="h-2 w-4" viewBox="0 0 16 8">
              <rect width="16" height="8" rx="2" fill={line.colour ?? palette[index % palette.length]} />
            </svg>
            {line.name}
          </span>
        ))}
      </figcaption>
    </figure>
  );
}
