"use client";

import { ResponsiveBoxPlot, type BoxPlotCustomLayerProps } from "@nivo/boxplot";
import { useSyncExternalStore } from "react";

export interface StrainSpread {
  strain: string;
  /** 10th, 25th, 50th, 75th and 90th percentiles of block biological efficiency; whiskers null where too few blocks lie beyond them. */
  percentiles: [number | null, number, number, number, number | null];
}

type Datum = { strain: string; efficiency: number };

/** The viewer's blocks of one strain: how many, and the biological efficiencies drawn as dots. */
export interface OwnStrainDots {
  strain: string;
  blocks: number;
  efficiencies: number[];
}

/**
 * Block biological efficiency per strain: box from the 25th to the 75th percentile, whiskers
 * to the 10th and 90th (so no single co-op block is drawn), with the viewer's own blocks as dots.
 */
const noSubscription = () => () => {};

export function StrainBoxplot({ spreads, ownBlocks }: { spreads: StrainSpread[]; ownBlocks: OwnStrainDots[] }) {
  // Five values per strain whose 0/25/50/75/100 % quantiles are exactly the published percentiles; a whisker not
  // published ends at its box.
  const data: Datum[] = spreads.flatMap(({ strain, percentiles: [p10, p25, p50, p75, p90] }) =>
    [p10 ?? p25, p25, p50, p75, p90 ?? p75].map((efficiency) => ({ strain, efficiency })),
  );
  const withoutWhiskers = spreads.filter((spread) => spread.percentiles[0] === null || spread.percentiles[4] === null);
  const shown = new Set(spreads.map((spread) => spread.strain));
  const ownShown = ownBlocks.filter((own) => shown.has(own.strain));
  const points = ownShown.flatMap((own) => own.efficiencies.map((efficiency) => ({ strain: own.strain, efficiency })));
  const thinned = ownShown.filter((own) => own.efficiencies.length < own.blocks);
  const values = [...data.map((d) => d.efficiency), ...points.map((p) => p.efficiency)];
  const OwnBlocks = ({ xScale, yScale }: BoxPlotCustomLayerProps<Datum>) => {
    const band = xScale as unknown as ((value: string) => number) & { bandwidth: () => number };
    const y = yScale as unknown as (value: number) => number;
    return (
      <g data-testid="own-blocks">
        {points.map((point, index) => (
          <circle
            key={index}
            cx={band(point.strain) + band.bandwidth() / 2 + (((index * 37) % 21) - 10) * (band.bandwidth() / 60)}
            cy={y(point.efficiency)}
            r={4}
            fill="#7a4f2a"
            fillOpacity={0.8}
            stroke="#fff"
            strokeWidth={1}
          >
            <title>{`Your block: ${point.efficiency.toFixed(1)} % BE`}</title>
          </circle>
        ))}
      </g>
    );
  };
  const inBrowser = useSyncExternalStore(
    noSubscription,
    () => true,
    () => false,
  );
  return (
    <figure className="space-y-2">
      <div className="h-80 w-full">
        {/* Drawn once in the browser: the chart's wrapper has a style attribute, which the Content
            Security Policy refuses in server-rendered HTML (set from script, it is allowed). */}
        {inBrowser ? (
          <ResponsiveBoxPlot<Datum>
            data={data}
            groupBy="strain"
            value="efficiency"
            groups={spreads.map((spread) => spread.strain)}
            quantiles={[0, 0.25, 0.5, 0.75, 1]}
            minValue={Math.max(0, Math.floor(Math.min(...values) - 5))}
            maxValue={Math.ceil(Math.max(...values) + 5)}
            margin={{ top: 16, right: 16, bottom: 48, left: 56 }}
            padding={0.4}
            colors={["#dce9e3"]}
            borderColor="#2e5e4e"
            borderWidth={2}
            medianColor="#1b392f"
            medianWidth={3}
            whiskerColor="#2e5e4e"
            axisLeft={{ legend: "Biological efficiency (%)", legendPosition: "middle", legendOffset: -44 }}
            axisBottom={{ tickSize: 0, tickPadding: 8 }}
            layers={["grid", "axes", "boxPlots", OwnBlocks]}
            animate={false}
            ariaLabel={`Spread of block biological efficiency per strain${points.length ? ", with your own blocks as dots" : ""}`}
          />
        ) : null}
      </div>
      <figcaption className="text-sm text-ink-soft">
        Boxes: middle half of the co-op&apos;s blocks; whiskers: 10th to 90th percentile; line: median.
        {withoutWhiskers.length
          ? ` No whiskers for ${withoutWhiskers.map((spread) => spread.strain).join(", ")}: fewer than 21 blocks, so a whisker would sit on a single block.`
          : ""}
        {points.length ? " Brown dots: your own blocks." : ""}
        {thinned.length
          ? ` You have ${ownShown.reduce((sum, own) => sum + own.blocks, 0).toLocaleString("en")} blocks here; where a strain has more than ${thinned[0].efficiencies.length}, that many dots stand for its blocks, spread evenly from your lowest to your highest.`
          : ""}
      </figcaption>
    </figure>
  );
}
