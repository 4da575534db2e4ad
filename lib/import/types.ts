import type { DecimalMark, MassUnit, MassUnitAsWritten } from "../units";
import type { Delimiter } from "./sniff";
import type { DateOrder } from "./dates";
import type { TextEncodingName } from "./decode";
import type { HeaderMapping } from "./headers";
import type { IssueCode } from "./issues";
import type { RegisterEntryText } from "./registers";
import type { SeasonLogColumnName } from "./schema";

export interface MassAsWritten {
  /** The cell exactly as written (trimmed), e.g. "2,5", "5 lb" or "4 lb 3 oz". */
  value: string;
  /** The unit that applied: written in the cell, named in the column header, or the upload's default. */
  unit: MassUnitAsWritten;
}

/**
 * One harvest (a flush of one block), or one block with no harvest yet (flush null).
 * Block columns left blank on a row take the block's value from its other rows.
 * Every row of the file gives a record even when it has errors (values that could not be
 * read are null, missing codes are ""); a file with any error issue must not be committed.
 */
export interface SeasonRecord {
  /** 1-based line in the file where the row starts (the header is line 1). */
  line: number;
  blockCode: string;
  strainCode: string;
  substrate: string | null;
  trialCode: string | null;
  arm: string | null;
  /** YYYY-MM-DD */
  inoculatedOn: string | null;
  /** The season (its starting year) the file names for the block; null when it follows the inoculation date. */
  seasonYear: number | null;
  wetBlockGrams: number | null;
  wetBlockAsWritten: MassAsWritten | null;
  /** Substrate moisture content, wet basis, as a fraction (0.62 for 62 %). */
  moisture: number | null;
  fruitingMethod: string | null;
  /** The farm's room the block fruited in, as written (matched to the farm's rooms by the planner). */
  fruitingRoom: string | null;
  flush: number | null;
  /** YYYY-MM-DD */
  harvestedOn: string | null;
  freshGrams: number | null;
  freshAsWritten: MassAsWritten | null;
  dryGrams: number | null;
  dryAsWritten: MassAsWritten | null;
  contaminated: boolean;
  /** YYYY-MM-DD */
  contaminatedOn: string | null;
  spentGrams: number | null;
  spentAsWritten: MassAsWritten | null;
  notes: string | null;
}

export interface SeasonLogIssue {
  /** 1-based physical line in the file where the row starts (the header is line 1); the first line of a group. */
  line: number;
  /** Stable machine code (see `issueCodes`): what the UI and tests match on, never the wording. */
  code: IssueCode;
  /** The column's header as written in the file. */
  column?: string;
  /** The cell as written in the file (cut to 200 characters). */
  value?: string;
  severity: "error" | "warning";
  /** What is wrong and what to do, naming the line(s), the column and the value. */
  message: string;
  /** When the same problem repeats on several rows: how many, and the lines as [first, last] runs. */
  count?: number;
  lineRanges?: [number, number][];
}

export interface SeasonLogOptions {
  /** File header → schema column (or "flush_2", "flush_2_date", "ignore"), as chosen by the grower. */
  mapping?: Record<string, string>;
  /** Unit for bare numbers in mass columns whose header names no unit. */
  defaultMassUnit?: MassUnit;
  dateOrder?: DateOrder;
  /** The decimal mark of every number in the file, as chosen by the grower. */
  decimal?: DecimalMark;
  /** The decimal mark of one column (by its header as written), as chosen by the grower; wins over `decimal`. */
  decimalByColumn?: Record<string, DecimalMark>;
  /** The co-op's strains (codes, or codes with their names); when given, a strain that is neither a code nor a name is an error. */
  knownStrains?: readonly (string | RegisterEntryText)[];
  /** YYYY-MM-DD; dates after it are warned about. Defaults to the current UTC date. */
  today?: string;
}

export interface SeasonLogDetected {
  encoding: TextEncodingName;
  delimiter: Delimiter;
  /** The decimal mark the file's numbers settle (or the grower chose); the mark most columns use when they differ. */
  decimal: DecimalMark;
  /** null when no date needed an order (none, or only ISO and unambiguous ones with no conflict). */
  dateOrder: DateOrder | "ambiguous" | null;
  format: "long" | "wide";
  mapping: HeaderMapping;
  /** Columns (by header) whose numbers read two ways and that nothing in the file settles: the grower must choose. */
  ambiguousDecimalColumns?: string[];
  /** For a spreadsheet file: its kind, the sheet read (null when none could be) and every sheet's name. */
  workbook?: { kind: "xlsx" | "ods"; sheet: string | null; sheets: string[] };
}

export interface SeasonLogResult {
  records: SeasonRecord[];
  issues: SeasonLogIssue[];
  detected: SeasonLogDetected;
}

export interface SeasonLogProgress {
  /** Input consumed so far: bytes, or characters when the input is text. */
  bytes: number;
  /** Data rows read so far. */
  rows: number;
}

export interface SeasonLogParserOptions extends SeasonLogOptions {
  onProgress?: (progress: SeasonLogProgress) => void;
  /** Rows between progress reports; 10 000 unless given. */
  progressEvery?: number;
}

/** Reads a season log chunk by chunk; `end()` returns the records and the report. */
export interface SeasonLogParser {
  write(chunk: string | Uint8Array): void;
  end(): SeasonLogResult;
}

/** One column of the file as the row reader uses it. */
export interface ColumnPlan {
  /** 0-based position in the row; -1 when the file has no such column. */
  index: number;
  header: string;
  unit: MassUnit | undefined;
}

export interface WideFlush {
  flush: number;
  weight: ColumnPlan;
  date: ColumnPlan | null;
}

export const absentColumn: ColumnPlan = { index: -1, header: "", unit: undefined };

/** What the header row decided: where each schema column is and how rows are laid out. */
export interface Layout {
  headerLine: number;
  headerWidth: number;
  mapping: HeaderMapping;
  format: "long" | "wide";
  /** False when the header is unusable (a required column missing, layouts mixed): rows are counted, not read. */
  readRows: boolean;
  columns: Readonly<Record<SeasonLogColumnName, ColumnPlan>>;
  /** Wide form: one entry per flush column, by flush number. */
  wide: readonly WideFlush[];
}
