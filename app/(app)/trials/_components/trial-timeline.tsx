import { timelineBar, timelineInWords, type TrialTimeline } from "@/lib/trials/timeline";

const periodColours = { inoculation: "fill-bark-600", fruiting: "fill-moss-600" } as const;

/**
 * The trial's timeline as one horizontal bar: the inoculation and fruiting windows, the due date
 * and today marked; the same in words beside it (the bar is hidden from screen readers). An SVG
 * of attributes only, as the pages' security policy allows no inline styles.
 */
export function TrialTimelineBar({ timeline, today }: { timeline: TrialTimeline; today: string }) {
  const bar = timelineBar(timeline, today);
  if (!bar)
    return <p className="text-sm text-ink-soft">No timeline set: no farm is counted behind, and the daily reminders skip this trial.</p>;
  return (
    <div data-testid="trial-timeline">
      <svg viewBox="0 0 100 14" preserveAspectRatio="none" className="h-10 w-full" aria-hidden="true">
        <rect x="0" y="4" width="100" height="6" className="fill-oat-200" />
        {bar.periods.map((period) => (
          <rect key={period.key} x={period.left} y="4" width={period.width} height="6" className={periodColours[period.key]} />
        ))}
        {bar.due ? <rect x={Math.min(bar.due.at, 99.4)} y="1" width="0.6" height="12" className="fill-danger-ink" /> : null}
        <rect x={Math.min(bar.today.at, 99.2)} y="0" width="0.8" height="14" className="fill-ink" />
      </svg>
      <div className="mt-1 flex justify-between text-xs text-ink-soft" aria-hidden="true">
        <span>{bar.start}</span>
        <span>{bar.end}</span>
      </div>
      <ul className="mt-3 flex flex-wrap gap-x-4 gap-y-1 text-xs text-ink-soft" aria-hidden="true">
        <li className="flex items-center gap-1">
          <span className="inline-block h-2 w-4 rounded-sm bg-bark-600" /> Inoculation
        </li>
        <li className="flex items-center gap-1">
          <span className="inline-block h-2 w-4 rounded-sm bg-moss-600" /> Fruiting expected
        </li>
        <li className="flex items-center gap-1">
          <span className="inline-block h-3 w-0.5 bg-danger-ink" /> Data due
        </li>
        <li className="flex items-center gap-1">
          <span className="inline-block h-3 w-1 bg-ink" /> Today ({today})
          {bar.today.within ? "" : today < bar.start ? ", before the timeline" : ", after it"}
        </li>
      </ul>
      <ul className="mt-3 space-y-1 text-sm" data-testid="trial-timeline-text">
        {timelineInWords(timeline, today).map((line) => (
          <li key={line}>{line}</li>
        ))}
      </ul>
    </div>
  );
}
