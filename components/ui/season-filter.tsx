import Link from "next/link";
import { seasonLabel, type SeasonStart } from "@/lib/seasons";

/**
 * Links that choose a season, kept in the address (?season=2026) so a view can be bookmarked.
 * `everything` names what the view shows without a season ("All seasons", "Last 12 months").
 */
export function SeasonFilter({
  path,
  seasons,
  start,
  current,
  everything,
  params = {},
}: {
  path: string;
  seasons: readonly number[];
  start: SeasonStart;
  current: number | null;
  everything: string;
  params?: Record<string, string | undefined>;
}) {
  const hrefFor = (season: number | null) => {
    const query = new URLSearchParams();
    for (const [key, value] of Object.entries(params)) if (value) query.set(key, value);
    if (season !== null) query.set("season", String(season));
    const text = query.toString();
    return text ? `${path}?${text}` : path;
  };
  const choices = [{ season: null, label: everything }, ...seasons.map((season) => ({ season, label: seasonLabel(season, start) }))];
  if (current !== null && !seasons.includes(current)) choices.push({ season: current, label: seasonLabel(current, start) });
  return (
    <nav aria-label="Season" className="mb-4 flex flex-wrap items-center gap-2 text-sm">
      <span className="font-medium text-ink">Season:</span>
      {choices.map((choice) => (
        <Link
          key={choice.season ?? "all"}
          href={hrefFor(choice.season)}
          aria-current={choice.season === current ? "page" : undefined}
          className={`inline-flex min-h-11 items-center rounded-lg border px-3 ${
            choice.season === current
              ? "border-moss-600 bg-moss-50 font-semibold text-moss-800"
              : "border-oat-300 bg-white text-moss-700 underline"
          }`}
        >
          {choice.label}
        </Link>
      ))}
    </nav>
  );
}
