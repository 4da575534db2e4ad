import type { DecimalMark, parseYesNo } from "../units";
import type { BlockState } from "./blocks";
import type { CellReading } from "./cells";
import type { DateReading } from "./dates";
import { mapHeaders, withoutBadTargets } from "./headers";
import type { RegisterEntryText, RegisterMatcher } from "./registers";
import { type SeasonLogColumnName, seasonLogColumnNames } from "./schema";
import {
  type ColumnPlan,
  type Layout,
  type MassAsWritten,
  type SeasonLogIssue,
  type SeasonLogOptions,
  type SeasonRecord,
  absentColumn,
} from "./types";

export type MassValue = { grams: number; written: MassAsWritten } | null;

/** The block columns of the row being read, shared by the records the row gives. */
export interface RowValues {
  line: number;
  blockCode: string;
  strainCode: string;
  substrate: string | null;
  trialCode: string | null;
  arm: string | null;
  inoculatedOn: string | null;
  seasonYear: number | null;
  wet: MassValue;
  moisture: number | null;
  fruitingMethod: string | null;
  fruitingRoom: string | null;
  contaminated: boolean | null;
  contaminatedOn: string | null;
  spent: MassValue;
  notes: string | null;
  /** Which of the row's block cells are read only at the end. */
  pending: number;
  block: BlockState | null;
}

export interface DateEvidence {
  dayFirstOnly: number;
  monthFirstOnly: number;
  firstDayFirst: { line: number; column: string; value: string } | null;
  firstMonthFirst: { line: number; column: string; value: string } | null;
  firstEither: { line: number; column: string; value: string } | null;
}

/** Cell readings already made, by cell text: a large file repeats its codes, dates and weights. */
export interface ReadingCaches {
  interned: Map<string, string>;
  /** By cell text: the reading and one shared copy of the text, which records hold until the end. */
  dates: Map<string, { reading: DateReading; written: string }>;
  strainChecks: Map<string, string | null>;
  moistures: Map<string, CellReading<number>>;
  yesNo: Map<string, ReturnType<typeof parseYesNo>>;
  /** Per mass column (by position), masses already read: records that wrote the same share one reading. */
  masses: Map<number, Map<string, NonNullable<MassValue>>>;
}

/**
 * Everything the row reader, the block checks and the end-of-file checks share: plain data,
 * made once per file by `createParseState` and handed to each stage's functions.
 */
export interface ParseState {
  options: SeasonLogOptions;
  today: string;
  strains: RegisterMatcher<RegisterEntryText> | null;
  decimal: DecimalMark;
  layout: Layout;
  records: SeasonRecord[];
  issues: SeasonLogIssue[];
  blocks: Map<string, BlockState>;
  caches: ReadingCaches;
  /**
   * Per record, bits for the cells read only at the end (see `pendingBits`): every date, which
   * waits for the file's date order (the record holds its text until then), and masses whose
   * decimal mark only the whole file can settle (the record holds their text, grams null).
   */
  pending: Uint8Array;
  /** Bits of the cells being read for the current harvest (or block columns). */
  rowPending: number;
  dateEvidence: DateEvidence;
  /** Per mass column (by position): what its numbers say about the decimal mark. */
  decimalEvidence: Map<number, ColumnDecimalEvidence>;
  row: RowValues;
  /** For a spreadsheet's row: which cells held numbers (read with "." and no guessing), else null. */
  typedNumbers: boolean[] | null;
}

export const pendingBits = { inoculated: 1, harvested: 2, contaminatedOn: 4, wet: 8, fresh: 16, dry: 32, spent: 64 } as const;
export const pendingMassBits = pendingBits.wet | pendingBits.fresh | pendingBits.dry | pendingBits.spent;

export interface ColumnDecimalEvidence {
  column: ColumnPlan;
  /** Numbers that read only with a decimal comma, and only with a decimal point. */
  comma: number;
  point: number;
  /** The first number that reads both ways, which waits for the end of the file. */
  firstEither: { line: number; value: string } | null;
}

function emptyColumns(): Record<SeasonLogColumnName, ColumnPlan> {
  const columns = {} as Record<SeasonLogColumnName, ColumnPlan>;
  for (const name of seasonLogColumnNames) columns[name] = absentColumn;
  return columns;
}

export function emptyLayout(): Layout {
  return {
    headerLine: 0,
    headerWidth: 0,
    mapping: withoutBadTargets(mapHeaders([])),
    format: "long",
    readRows: true,
    columns: emptyColumns(),
    wide: [],
  };
}

export function emptyCaches(): ReadingCaches {
  return { interned: new Map(), dates: new Map(), strainChecks: new Map(), moistures: new Map(), yesNo: new Map(), masses: new Map() };
}

export function createParseState(options: SeasonLogOptions, today: string, strains: RegisterMatcher<RegisterEntryText> | null): ParseState {
  return {
    options,
    today,
    strains,
    decimal: ".",
    layout: emptyLayout(),
    records: [],
    issues: [],
    blocks: new Map(),
    caches: emptyCaches(),
    pending: new Uint8Array(1024),
    rowPending: 0,
    dateEvidence: { dayFirstOnly: 0, monthFirstOnly: 0, firstDayFirst: null, firstMonthFirst: null, firstEither: null },
    decimalEvidence: new Map(),
    typedNumbers: null,
    row: {
      line: 0,
      blockCode: "",
      strainCode: "",
      substrate: null,
      trialCode: null,
      arm: null,
      inoculatedOn: null,
      seasonYear: null,
      wet: null,
      moisture: null,
      fruitingMethod: null,
      fruitingRoom: null,
      contaminated: null,
      contaminatedOn: null,
      spent: null,
      notes: null,
      pending: 0,
      block: null,
    },
  };
}
