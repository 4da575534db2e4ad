import { z } from "zod";

/**
 * Seasons: a co-op's growing year starts on a day of its choosing (co-op settings), and a block
 * belongs to the season in which it was inoculated, or to the season its season log names.
 * A season is known by the year in which it starts: with a start on 1 March, season 2026 runs
 * from 1 March 2026 to 28 or 29 February 2027 and is shown "2026/27".
 */

export type SeasonStart = { month: number; day: number };

/** A season that starts on 1 January is the calendar year. */
export const calendarYear: SeasonStart = { month: 1, day: 1 };

/** Seasons the app accepts, as dates elsewhere (lib/import/dates.ts reads 1970–2099 in a file). */
export const earliestSeason = 1970;
export const latestSeason = 2099;

const monthNames = [
  "January",
  "February",
  "March",
  "April",
  "May",
  "June",
  "July",
  "August",
  "September",
  "October",
  "November",
  "December",
];

// Days in each month of a year that is not a leap year: a season must start on a day every year has.
const daysInMonth = [31, 28, 31, 30, 31, 30, 31, 31, 30, 31, 30, 31];

/**
 * What is wrong with a season start, in words for the coordinator, or null. 29 February is refused:
 * in three years out of four there is no such day, and the season would have no first day.
 */
export function seasonStartProblem(start: SeasonStart): string | null {
  const { month, day } = start;
  if (!Number.isInteger(month) || month < 1 || month > 12) return "Choose the month the season starts in, January to December.";
  if (!Number.isInteger(day) || day < 1) return "Enter the day of the month the season starts on, such as 1.";
  if (month === 2 && day === 29) return "A season cannot start on 29 February: most years have no such day. Choose 28 February or 1 March.";
  const last = daysInMonth[month - 1] ?? 31;
  if (day > last) return `${monthNames[month - 1]} has ${last} days: enter a day from 1 to ${last}.`;
  return null;
}

function startOrThrow(start: SeasonStart): SeasonStart {
  const problem = seasonStartProblem(start);
  if (problem) throw new RangeError(problem);
  return start;
}

/**
 * The season (its starting year) a day belongs to, the day written YYYY-MM-DD. The start day itself
 * belongs to the new season; a day before it, to the season that started the year before.
 */
export function seasonOfDate(isoDate: string, start: SeasonStart): number {
  const { month, day } = startOrThrow(start);
  const match = /^(\d{4})-(\d{2})-(\d{2})/.exec(isoDate);
  if (!match) throw new RangeError(`Not a date written YYYY-MM-DD: "${isoDate}".`);
  const [year, m, d] = [Number(match[1]), Number(match[2]), Number(match[3])];
  return m < month || (m === month && d < day) ? year - 1 : year;
}

/** A block's season: the one its season log names, else the one it was inoculated in, else none. */
export function blockSeason(block: { seasonYear: number | null; inoculatedOn: string | null }, start: SeasonStart): number | null {
  if (block.seasonYear !== null) return block.seasonYear;
  return block.inoculatedOn ? seasonOfDate(block.inoculatedOn, start) : null;
}

/** "2026" for a calendar-year season, "2026/27" for one that runs into the next year. */
export function seasonLabel(seasonYear: number, start: SeasonStart): string {
  if (start.month === 1 && start.day === 1) return String(seasonYear);
  return `${seasonYear}/${String((seasonYear + 1) % 100).padStart(2, "0")}`;
}

/** "1 March" */
export function seasonStartLabel(start: SeasonStart): string {
  return `${start.day} ${monthNames[start.month - 1] ?? "?"}`;
}

export type SeasonReading = { ok: true; seasonYear: number } | { ok: false; code: "season_unreadable"; message: string };

const range = `${earliestSeason} to ${latestSeason}`;

/**
 * Reads a season as a grower writes it: the year it starts ("2026"), or the two years it spans
 * ("2026/27", "2026/2027", "2026-27"), which must follow one another. Both mean the season that
 * starts in 2026. A blank cell is null (the block follows its inoculation date).
 */
export function readSeason(text: string): SeasonReading | null {
  const written = text.trim();
  if (written === "") return null;
  const single = /^(\d{4})$/.exec(written);
  const pair = /^(\d{4})\s*[/\-–]\s*(\d{2}|\d{4})$/.exec(written);
  const first = Number((single ?? pair)?.[1]);
  if (!single && !pair) {
    return {
      ok: false,
      code: "season_unreadable",
      message: `"${written}" is not a season. Write the year the season starts, such as 2026, or the two years it spans, such as 2026/27; or leave the cell blank to take the season from the inoculation date.`,
    };
  }
  if (first < earliestSeason || first > latestSeason) {
    return { ok: false, code: "season_unreadable", message: `"${written}" is outside the seasons the co-op records (${range}).` };
  }
  if (pair?.[2] !== undefined) {
    const second = pair[2].length === 2 ? Math.floor(first / 100) * 100 + Number(pair[2]) : Number(pair[2]);
    const next = first + 1;
    // "1999/00" spans a century.
    if (second !== next && !(pair[2].length === 2 && second + 100 === next)) {
      return {
        ok: false,
        code: "season_unreadable",
        message: `"${written}" names two years that do not follow one another. A season spans one year into the next: write ${first}/${String(next % 100).padStart(2, "0")} or just ${first}.`,
      };
    }
  }
  return { ok: true, seasonYear: first };
}

/**
 * A season in an address (?season=2026 or ?season=2026/27), checked: absent or blank is every
 * season; anything else that is not a season is refused with what to write instead.
 */
export const seasonInAddressSchema = z.preprocess(
  (value) => {
    const single: unknown = Array.isArray(value) ? value[0] : value;
    return single === "" || single === null ? undefined : single;
  },
  z
    .string()
    .transform((text, context) => {
      const reading = readSeason(text);
      if (reading?.ok) return reading.seasonYear;
      context.addIssue({
        code: "custom",
        message: `The season in the address, "${text}", is not a season: write the year it starts, such as 2026, or the two years it spans, such as 2026/27 (${earliestSeason} to ${latestSeason}).`,
      });
      return z.NEVER;
    })
    .optional(),
);

/** The Co-op settings form for the season start: a month and a day every year has. */
export const seasonStartSchema = z
  .object({
    seasonStartMonth: z.coerce
      .number("Choose the month the season starts in.")
      .int("Choose the month the season starts in.")
      .min(1, "Choose the month the season starts in.")
      .max(12, "Choose the month the season starts in."),
    seasonStartDay: z.coerce.number("Enter the day of the month as a number, such as 1.").int("Enter a whole day of the month, such as 1."),
  })
  .superRefine((input, context) => {
    const problem = seasonStartProblem({ month: input.seasonStartMonth, day: input.seasonStartDay });
    if (problem) context.addIssue({ code: "custom", path: ["seasonStartDay"], message: problem });
  });

export const monthOptions = monthNames.map((name, index) => ({ value: String(index + 1), label: name }));
