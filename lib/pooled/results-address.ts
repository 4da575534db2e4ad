import { z } from "zod";
import { seasonInAddressSchema } from "@/lib/seasons";
import { flushWindows, type FlushWindow } from "./types";

/** What a Co-op results view is: every filter, as it stands in the page's address and in GET /api/results. */
export interface ResultsSelection {
  species?: string;
  recipe?: string;
  method?: string;
  window: FlushWindow;
  /** A season's starting year. */
  season?: number;
}

/** One value per name: a repeated name (?recipe=a&recipe=b) counts by its first value. */
const first = (value: unknown) => (Array.isArray(value) ? (value as unknown[])[0] : value);
const blankIsAbsent = (value: unknown) => {
  const single = first(value);
  return single === "" || single === null ? undefined : single;
};

const optionalId = (what: string) =>
  z.preprocess(blankIsAbsent, z.uuid(`The ${what} in the address is not one of the co-op's; choose it from the list.`).optional());

export const resultsSelectionSchema = z.object({
  species: optionalId("species"),
  recipe: optionalId("substrate recipe"),
  method: optionalId("fruiting method"),
  window: z.preprocess(
    (value) => blankIsAbsent(value) ?? "all",
    z.enum(flushWindows, "The flushes counted in the address must be all, 1-2 or 1 (all flushes, the first two, or the first)."),
  ),
  season: seasonInAddressSchema,
});

export type ResultsAddressReading =
  { ok: true; selection: ResultsSelection } | { ok: false; problems: { field: string; message: string }[] };

/** Reads a results address (the page's searchParams or the API's query); each problem says what to do. */
export function readResultsAddress(params: Record<string, unknown>): ResultsAddressReading {
  const parsed = resultsSelectionSchema.safeParse(params);
  if (parsed.success) return { ok: true, selection: parsed.data };
  return { ok: false, problems: parsed.error.issues.map((issue) => ({ field: issue.path.join("."), message: issue.message })) };
}

/** The address of a view: only what differs from the defaults, in a fixed order, so one view has one address. */
export function resultsAddress(path: string, selection: ResultsSelection): string {
  const params = new URLSearchParams();
  if (selection.species) params.set("species", selection.species);
  if (selection.recipe) params.set("recipe", selection.recipe);
  if (selection.method) params.set("method", selection.method);
  if (selection.window !== "all") params.set("window", selection.window);
  if (selection.season !== undefined) params.set("season", String(selection.season));
  const text = params.toString();
  return text ? `${path}?${text}` : path;
}
