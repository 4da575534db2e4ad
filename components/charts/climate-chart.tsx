"use client";

import { ResponsiveLine } from "@nivo/line";
import type { ChartPoint } from "@/lib/climate/chart";
import { formatDay, type TimeDisplay } from "@/lib/time/display";

export interface RegimeMark {
  /** Milliseconds since the epoch: the start of the day the regime changed. */
  at: number;
  label: string;
}

function Panel({
  title,
  unit,
  points,
  colour,
  range,
  marks,
  display,
}: {
  title: string;
  unit: string;
  points: ChartPoint[];
  colour: string;
  range: [number | "auto", number | "auto"];
  marks: RegimeMark[];
  display: TimeDisplay;
}) {
  return (
    <div className="h-56 w-full">
      <ResponsiveLine
        data={[{ id: title, data: points.map((point) => ({ x: new Date(point.x), y: point.y })) }]}
        xScale={{ type: "time" }}
        yScale={{ type: "linear", min: range[0], max: range[1] }}
        margin={{ top: 12, right: 16, bottom: 36, left: 52 }}
        colors={[colour]}
        lineWidth={2}
        enablePoints={false}
        enableGridX={false}
        isInteractive={false}
        animate={false}
        axisBottom={{ tickValues: 5, format: (value: Date) => formatDay(value, display), tickSize: 4 }}
        axisLeft={{ legend: unit, legendPosition: "middle", legendOffset: -40, tickValues: 5 }}
        markers={marks.map((mark) => ({
          axis: "x" as const,
          value: new Date(mark.at),
          lineStyle: { stroke: "#7a4f2a", strokeWidth: 2, strokeDasharray: "4 3" },
          legend: mark.label,
          legendPosition: "top-right" as const,
        }))}
        role="img"
        ariaLabel={`${title} over time${marks.length ? ", with the days the room's climate regime changed marked" : ""}`}
      />
    </div>
  );
}

/** A room's log: relative humidity and temperature over time, the regime changes as dashed lines. */
export function ClimateChart({
  humidity,
  temperature,
  marks,
  display,
}: {
  humidity: ChartPoint[];
  temperature: ChartPoint[];
  marks: RegimeMark[];
  display: TimeDisplay;
}) {
  return (
    <figure className="space-y-2" data-testid="climate-chart">
      <Panel title="Relative humidity" unit="RH (%)" points={humidity} colour="#2e5e4e" range={[0, 100]} marks={marks} display={display} />
      <Panel title="Temperature" unit="°C" points={temperature} colour="#8f2a1f" range={["auto", "auto"]} marks={marks} display={display} />
      <figcaption className="text-sm text-ink-soft">
        Each point is the mean of the readings around it; a break in a line is a gap in the log.
        {marks.length ? " Dashed lines: the days the room's climate regime changed." : ""}
      </figcaption>
    </figure>
  );
}
