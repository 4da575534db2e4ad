import { type MassUnit, massUnitFromWord } from "../units";
import { type SeasonLogColumnName, seasonLogColumnNames, seasonLogColumns } from "./schema";
import { editDistance } from "./registers";

/**
 * Where one column of the file goes: a schema column, a wide-form flush column
 * ("flush_2" for the fresh weight of flush 2, "flush_2_date" for its harvest date),
 * or nowhere ("ignore").
 */
export type ColumnTarget = SeasonLogColumnName | `flush_${number}` | `flush_${number}_date` | "ignore";

export interface MappedColumn {
  /** The header as written in the file. */
  header: string;
  /** 1-based position of the column in the file. */
  position: number;
  target: ColumnTarget | null;
  /** Unit named in the header, e.g. "(lb)" or "_g"; it applies to bare numbers in the column. */
  unit: MassUnit | null;
  /** given: from the mapping option; exact: the schema name; synonym: a known other name; guess: a loose name or a near spelling, to confirm. */
  how: "given" | "exact" | "synonym" | "guess" | "unmatched";
}

export interface HeaderMapping {
  columns: MappedColumn[];
  /** Header → target for every column used, in the same shape as the `mapping` option, so the UI can send it back edited. */
  used: Record<string, string>;
  /** Headers that match no column; their values are ignored. */
  unmatched: string[];
  /** Headers matched by a guess; the UI should ask the grower to confirm. */
  uncertain: string[];
  /** Required schema columns that no header maps to. */
  missingRequired: SeasonLogColumnName[];
  /** True when every required column was found and nothing was guessed. */
  certain: boolean;
}

const bracketed = /[(\[{]\s*([^)\]}]*?)\s*[)\]}]/g;
const unitSuffix = /^(.+?)[\s_.-]+(?:in\s+)?(g|kg|lbs?|oz|grams?|kilograms?|pounds?|ounces?)$/;
const inUnit = /^in\s+/;
const diacritics = /[\u0300-\u036f]/g;
const notLetterOrDigit = /[^a-z0-9]/g;
const flushWeight =
  /^(?:flush|fl|break|harvest)(\d{1,2})(?:freshweight|fresh|weight|yield|mass)?$|^(\d{1,2})(?:st|nd|rd|th)?flush(?:freshweight|fresh|weight|yield|mass)?$/;
const flushDate =
  /^(?:flush|fl|break|harvest)(\d{1,2})(?:date|harvested|harvestedon|harvestdate|picked|pickedon)$|^(\d{1,2})(?:st|nd|rd|th)?flush(?:date|harvested|harvestedon|harvestdate|picked|pickedon)$/;
const targetName = /^flush_(\d{1,3})(_date)?$/;

/** Lower case, accents and punctuation dropped: "Block ID" and "block_id" both become "blockid". */
export function normaliseHeader(text: string): string {
  return text.normalize("NFD").replace(diacritics, "").toLowerCase().replace(notLetterOrDigit, "");
}

/** Splits a header into its name and the mass unit it names, e.g. "Wet block (lb)" → "wetblock", "lb". */
export function readHeader(header: string): { name: string; unit: MassUnit | null } {
  let unit: MassUnit | null = null;
  let rest = header
    .trim()
    .toLowerCase()
    .replace(bracketed, (_, inside: string) => {
      unit ??= massUnitFromWord(inside.replace(inUnit, "").replace(notLetterOrDigit, ""));
      return " ";
    });
  rest = rest.replace(/%/g, " ").trim();
  const suffix = unitSuffix.exec(rest);
  if (suffix !== null && unit === null) {
    unit = massUnitFromWord(suffix[2]);
    rest = suffix[1];
  }
  return { name: normaliseHeader(rest), unit };
}

const sureNames = new Map<string, SeasonLogColumnName>();
const looseNames = new Map<string, SeasonLogColumnName>();
for (const column of seasonLogColumns) {
  sureNames.set(normaliseHeader(column.name), column.name);
  for (const synonym of column.synonyms) sureNames.set(normaliseHeader(synonym), column.name);
  for (const synonym of column.looseSynonyms) looseNames.set(normaliseHeader(synonym), column.name);
}
const sureNameList = [...sureNames.entries()];
// Near-spelling guesses cost a distance per header and name; a sheet this wide is not a season log anyway.
const mostColumnsToGuess = 200;

function wideTarget(name: string): ColumnTarget | null {
  let match = flushWeight.exec(name);
  if (match !== null) return `flush_${Number(match[1] ?? match[2])}`;
  match = flushDate.exec(name);
  if (match !== null) return `flush_${Number(match[1] ?? match[2])}_date`;
  return null;
}

/** Checks a target named in the mapping option; null when it names no column. */
export function parseTarget(value: string): ColumnTarget | null {
  const text = value.trim().toLowerCase();
  if (text === "" || text === "ignore") return "ignore";
  if ((seasonLogColumnNames as readonly string[]).includes(text)) return text as SeasonLogColumnName;
  const match = targetName.exec(text);
  if (match !== null && Number(match[1]) >= 1)
    return match[2] === undefined ? `flush_${Number(match[1])}` : `flush_${Number(match[1])}_date`;
  return null;
}

/**
 * Matches the file's headers to schema columns: the mapping option first, then schema
 * names and sure synonyms, then wide-form flush columns, then loose synonyms and near
 * spellings (marked as guesses). Each target is taken by one column only; `given`
 * lists mapping entries whose target is not a column, so the caller can report them.
 */
export function mapHeaders(headers: readonly string[], given: Record<string, string> = {}): HeaderMapping & { badTargets: string[] } {
  const columns: MappedColumn[] = headers.map((header, index) => ({
    header,
    position: index + 1,
    target: null,
    unit: readHeader(header).unit,
    how: "unmatched",
  }));
  const taken = new Set<string>();
  const badTargets: string[] = [];
  const givenByHeader = new Map<string, string>();
  for (const [header, target] of Object.entries(given)) givenByHeader.set(header.trim(), target);

  for (const column of columns) {
    const wanted = givenByHeader.get(column.header.trim());
    if (wanted === undefined) continue;
    const target = parseTarget(wanted);
    if (target === null) {
      badTargets.push(wanted);
      continue;
    }
    if (target !== "ignore" && taken.has(target)) continue;
    column.target = target;
    column.how = "given";
    if (target !== "ignore") taken.add(target);
  }
  const names = headers.map((header) => readHeader(header).name);
  const assign = (pick: (name: string) => ColumnTarget | null | undefined, how: MappedColumn["how"]): void => {
    columns.forEach((column, index) => {
      if (column.target !== null || names[index] === "") return;
      const target = pick(names[index]);
      if (target === null || target === undefined || taken.has(target)) return;
      column.target = target;
      column.how = how;
      taken.add(target);
    });
  };
  assign((name) => sureNames.get(name), "synonym");
  for (const column of columns) {
    if (column.how === "synonym" && (seasonLogColumnNames as readonly string[]).includes(column.header.trim().toLowerCase()))
      column.how = "exact";
  }
  assign(wideTarget, "synonym");
  assign((name) => looseNames.get(name), "guess");
  if (headers.length <= mostColumnsToGuess) assign(nearestName, "guess");

  const used: Record<string, string> = {};
  const unmatched: string[] = [];
  const uncertain: string[] = [];
  for (const column of columns) {
    const key = column.header.trim() === "" ? `(column ${column.position})` : column.header;
    if (column.target === null) unmatched.push(key);
    else if (column.target !== "ignore") used[key in used ? `${key} (column ${column.position})` : key] = column.target;
    if (column.how === "guess") uncertain.push(key);
  }
  const missingRequired = (["block_id", "strain"] as const).filter((name) => !taken.has(name));
  return {
    columns,
    used,
    unmatched,
    uncertain,
    missingRequired,
    certain: uncertain.length === 0 && missingRequired.length === 0,
    badTargets,
  };
}

/** The mapping without the list of bad targets, as the parser reports it. */
export function withoutBadTargets(mapped: HeaderMapping & { badTargets?: string[] }): HeaderMapping {
  const mapping = { ...mapped };
  delete mapping.badTargets;
  return mapping;
}

function nearestName(name: string): SeasonLogColumnName | null {
  if (name.length < 5) return null;
  const allowed = name.length >= 6 ? 2 : 1;
  let best: SeasonLogColumnName | null = null;
  let bestDistance = allowed + 1;
  for (const [candidate, column] of sureNameList) {
    if (Math.abs(candidate.length - name.length) > allowed) continue;
    const distance = editDistance(name, candidate);
    if (distance < bestDistance) {
      best = column;
      bestDistance = distance;
    }
  }
  return best;
}
