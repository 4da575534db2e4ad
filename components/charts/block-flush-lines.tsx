"use client";

import { ResponsiveLine } from "@nivo/line";
import { useSyncExternalStore } from "react";

export interface BlockFlushLinesProps {
  blockCode: string;
  strainName: string;
  /** The block's flushes: x in days from inoculation (or the flush number without dates), y what it had given by then. */
  overTime: { x: number; y: number; flush: number }[];
  overTimeAxis: { x: string; y: string };
  /** Share of yield by flush in whole percent: the co-op's for the strain, and the block's own once it is spent. */
  coopShares: { flush: number; percent: number }[] | null;
  ownShares: { flush: number; percent: number }[] | null;
}

const moss = "#2e5e4e";
const bark = "#7a4f2a";
const theme = { text: { fill: "#44544f", fontSize: 11 }, grid: { line: { stroke: "#ebe7dc" } } };
const noSubscription = () => () => {};

/**
 * A block's flushes over time beside the co-op's share of yield by flush for its strain. Drawn once
 * the page has loaded in the browser: nivo sizes its chart with style attributes, which the Content
 * Security Policy refuses in the server's HTML but not when set from a script.
 */
export function BlockFlushLines({ blockCode, strainName, overTime, overTimeAxis, coopShares, ownShares }: BlockFlushLinesProps) {
  const inBrowser = useSyncExternalStore(
    noSubscription,
    () => true,
    () => false,
  );
  const shareSeries = [
    ...(coopShares ? [{ id: `Co-op, ${strainName}`, data: coopShares.map((share) => ({ x: share.flush, y: share.percent })) }] : []),
    ...(ownShares ? [{ id: `Block ${blockCode}`, data: ownShares.map((share) => ({ x: share.flush, y: share.percent })) }] : []),
  ];
  const flushes = Math.max(1, ...shareSeries.flatMap((series) => series.data.map((point) => point.x)));
  const frame = "h-56 w-full rounded-lg border border-oat-200 bg-oat-50";
  return (
    <div className="grid gap-4 lg:grid-cols-2" data-testid="block-flush-chart">
      <figure className="space-y-1">
        <figcaption className="text-sm font-semibold text-moss-800">Block {blockCode} over time</figcaption>
        <div className={frame}>
          {inBrowser ? (
            <ResponsiveLine
              data={[{ id: `Block ${blockCode}`, data: overTime.map(({ x, y }) => ({ x, y })) }]}
              xScale={{ type: "linear", min: 0, max: "auto" }}
              yScale={{ type: "linear", min: 0, max: "auto" }}
              margin={{ top: 12, right: 16, bottom: 44, left: 56 }}
              colors={[bark]}
              lineWidth={2.5}
              pointSize={8}
              pointBorderWidth={1}
              pointBorderColor="#ffffff"
              axisBottom={{ legend: overTimeAxis.x, legendPosition: "middle", legendOffset: 34, tickValues: 5 }}
              axisLeft={{ legend: overTimeAxis.y, legendPosition: "middle", legendOffset: -46, tickValues: 5 }}
              theme={theme}
              isInteractive={false}
              animate={false}
              role="img"
              ariaLabel={`Block ${blockCode}: ${overTime.map((point) => `flush ${point.flush}, ${point.y.toFixed(1)}`).join("; ")} (${overTimeAxis.y})`}
            />
          ) : null}
        </div>
      </figure>
      <figure className="space-y-1">
        <figcaption className="text-sm font-semibold text-moss-800">Share of yield by flush</figcaption>
        <div className={frame}>
          {inBrowser && shareSeries.length > 0 ? (
            <ResponsiveLine
              data={shareSeries}
              xScale={{ type: "linear", min: 1, max: Math.max(2, flushes) }}
              yScale={{ type: "linear", min: 0, max: 100 }}
              margin={{ top: 12, right: 16, bottom: 44, left: 56 }}
              colors={[...(coopShares ? [moss] : []), ...(ownShares ? [bark] : [])]}
              lineWidth={2.5}
              pointSize={8}
              pointBorderWidth={1}
              pointBorderColor="#ffffff"
              axisBottom={{
                legend: "Flush",
                legendPosition: "middle",
                legendOffset: 34,
                tickValues: Array.from({ length: Math.max(2, flushes) }, (_, index) => index + 1),
              }}
              axisLeft={{ legend: "% of the block's yield", legendPosition: "middle", legendOffset: -46, tickValues: [0, 25, 50, 75, 100] }}
              theme={theme}
              isInteractive={false}
              animate={false}
              role="img"
              ariaLabel={shareSeries
                .map((series) => `${series.id}: ${series.data.map((point) => `flush ${point.x} ${point.y} %`).join(", ")}`)
                .join(". ")}
            />
          ) : null}
        </div>
        <p className="flex flex-wrap gap-3 text-sm text-ink-soft">
          {shareSeries.map((series, index) => (
            <span key={series.id} className="inline-flex items-center gap-1">
              {/* An SVG swatch, not a style attribute: the Content Security Policy allows no inline styles. */}
              <svg aria-hidden="true" className="h-2 w-4" viewBox="0 0 16 8">
                <rect width="16" height="8" rx="2" fill={coopShares && index === 0 ? moss : bark} />
              </svg>
              {series.id}
            </span>
          ))}
        </p>
      </figure>
    </div>
  );
}
