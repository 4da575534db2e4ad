import {
  type DecimalMark,
  type MassUnit,
  type MassUnitAsWritten,
  drySubstrateGrams,
  formatMass,
  parseMoisture,
  parseYesNo,
  readMass,
} from "../units";
import { CsvTokenizer, type Delimiter, sampleRows, sniffDecimal, sniffDelimiter } from "./csv";
import { type DateOrder, type DateReading, describeOrder, readDate, wrongOrderMessage } from "./dates";
import { ByteDecoder, type TextEncodingName } from "./encoding";
import { type HeaderMapping, mapHeaders } from "./headers";
import { type SeasonLogColumnName, seasonLogColumnNames } from "./schema";
import { StrainRegister } from "./strains";

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
  wetBlockGrams: number | null;
  wetBlockAsWritten: MassAsWritten | null;
  /** Substrate moisture content, wet basis, as a fraction (0.62 for 62 %). */
  moisture: number | null;
  fruitingMethod: string | null;
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
  /** 1-based physical line in the file where the row starts (the header is line 1). */
  line: number;
  /** The column's header as written in the file. */
  column?: string;
  value?: string;
  severity: "error" | "warning";
  /** What is wrong and what to do, naming the line, the column and the value. */
  message: string;
}

export interface SeasonLogOptions {
  /** File header → schema column (or "flush_2", "flush_2_date", "ignore"), as chosen by the grower. */
  mapping?: Record<string, string>;
  /** Unit for bare numbers in mass columns whose header names no unit. */
  defaultMassUnit?: MassUnit;
  dateOrder?: DateOrder;
  decimal?: DecimalMark;
  /** The co-op's strain codes; when given, an unknown code is an error. */
  knownStrains?: string[];
  /** YYYY-MM-DD; dates after it are warned about. Defaults to the current UTC date. */
  today?: string;
}

export interface SeasonLogDetected {
  encoding: TextEncodingName;
  delimiter: Delimiter;
  decimal: DecimalMark;
  /** null when no date needed an order (none, or only ISO and unambiguous ones with no conflict). */
  dateOrder: DateOrder | "ambiguous" | null;
  format: "long" | "wide";
  mapping: HeaderMapping;
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

const sniffLength = 64 * 1024;
const longestCell = 10_000;
const mostRowsAboveHeader = 9;
const longestValueInReport = 200;
const mostInternedTexts = 20_000;
const mostCachedDates = 50_000;
const moistureTolerance = 0.0005;
const massTolerance = 0.005;
/** Above this, fresh weight over dry substrate (biological efficiency) is implausible for sawdust blocks. */
const highestPlausibleEfficiency = 2.5;

const flushNumber = /^(?:flush|fl|f|#)?\s*(\d{1,3})(?:\.0+)?(?:st|nd|rd|th)?$/i;
const isoDay = /^\d{4}-\d{2}-\d{2}$/;
const controlCharacters = /[\u0000-\u0008\u000e-\u001f\ufffd]/g;

const inoculatedBit = 1;
const harvestedBit = 2;
const contaminatedOnBit = 4;

type BlockAttribute =
  | "substrate"
  | "trialCode"
  | "arm"
  | "inoculatedOn"
  | "wetBlockGrams"
  | "moisture"
  | "fruitingMethod"
  | "contaminatedOn"
  | "spentGrams"
  | "strainCode";

/** Position of each block attribute in `BlockState.source`. */
const slot: Readonly<Record<BlockAttribute, number>> = {
  strainCode: 0,
  substrate: 1,
  trialCode: 2,
  arm: 3,
  inoculatedOn: 4,
  wetBlockGrams: 5,
  moisture: 6,
  fruitingMethod: 7,
  contaminatedOn: 8,
  spentGrams: 9,
};
// Block states are many in a large file: arrays made whole (not grown by push) hold no spare room.
const noHarvests: readonly number[] = [];

interface BlockAttributeRule {
  field: BlockAttribute;
  slot: number;
  column: SeasonLogColumnName;
  words: string;
  same: (a: SeasonRecord, b: SeasonRecord) => boolean;
  shown: (record: SeasonRecord) => string;
}

const sameText = (field: BlockAttribute) => (a: SeasonRecord, b: SeasonRecord) => a[field] === b[field];
const sameMass = (field: "wetBlockGrams" | "spentGrams") => (a: SeasonRecord, b: SeasonRecord) =>
  Math.abs((a[field] as number) - (b[field] as number)) <= massTolerance * Math.max(a[field] as number, b[field] as number);
const shownText = (field: BlockAttribute) => (record: SeasonRecord) => String(record[field]);
const shownMass = (written: "wetBlockAsWritten" | "spentAsWritten") => (record: SeasonRecord) => record[written]?.value ?? "";

// Block columns compared between rows while reading; the dates wait for the file's date order.
const rowBlockAttributes: readonly BlockAttributeRule[] = [
  {
    field: "strainCode",
    slot: slot.strainCode,
    column: "strain",
    words: "strain",
    same: sameText("strainCode"),
    shown: shownText("strainCode"),
  },
  {
    field: "substrate",
    slot: slot.substrate,
    column: "substrate",
    words: "substrate",
    same: sameText("substrate"),
    shown: shownText("substrate"),
  },
  { field: "trialCode", slot: slot.trialCode, column: "trial", words: "trial", same: sameText("trialCode"), shown: shownText("trialCode") },
  { field: "arm", slot: slot.arm, column: "arm", words: "trial arm", same: sameText("arm"), shown: shownText("arm") },
  {
    field: "wetBlockGrams",
    slot: slot.wetBlockGrams,
    column: "block_wet_weight",
    words: "wet block weight",
    same: sameMass("wetBlockGrams"),
    shown: shownMass("wetBlockAsWritten"),
  },
  {
    field: "moisture",
    slot: slot.moisture,
    column: "substrate_moisture",
    words: "substrate moisture",
    same: (a, b) => Math.abs((a.moisture as number) - (b.moisture as number)) <= moistureTolerance,
    shown: (record) => `${Math.round((record.moisture as number) * 1000) / 10} %`,
  },
  {
    field: "fruitingMethod",
    slot: slot.fruitingMethod,
    column: "fruiting_method",
    words: "fruiting method",
    same: sameText("fruitingMethod"),
    shown: shownText("fruitingMethod"),
  },
  {
    field: "spentGrams",
    slot: slot.spentGrams,
    column: "spent_weight",
    words: "spent block weight",
    same: sameMass("spentGrams"),
    shown: shownMass("spentAsWritten"),
  },
];
const dateBlockAttributes: readonly BlockAttributeRule[] = [
  {
    field: "inoculatedOn",
    slot: slot.inoculatedOn,
    column: "inoculated_on",
    words: "inoculation date",
    same: sameText("inoculatedOn"),
    shown: shownText("inoculatedOn"),
  },
  {
    field: "contaminatedOn",
    slot: slot.contaminatedOn,
    column: "contaminated_on",
    words: "contamination date",
    same: sameText("contaminatedOn"),
    shown: shownText("contaminatedOn"),
  },
];

interface BlockState {
  /** The code as first written; rows of the block share this one string. */
  code: string;
  firstLine: number;
  /** Index of the first record that gave each block attribute a value (by `slot`), or -1. */
  source: number[];
  /** The first yes/no written in the contaminated column, and its line. */
  contaminated: boolean | null;
  contaminatedLine: number;
  /** Flush number and line of each harvest, in pairs: [flush, line, flush, line …]. */
  harvests: readonly number[];
  freshGrams: number;
}

type MassValue = { grams: number; written: MassAsWritten } | null;

/** The block columns of the row being read, shared by the records the row gives. */
interface RowValues {
  line: number;
  blockCode: string;
  strainCode: string;
  substrate: string | null;
  trialCode: string | null;
  arm: string | null;
  inoculatedOn: string | null;
  wet: MassValue;
  moisture: number | null;
  fruitingMethod: string | null;
  contaminated: boolean | null;
  contaminatedOn: string | null;
  spent: MassValue;
  notes: string | null;
  /** Which of the row's block dates wait for the file's date order. */
  pendingDates: number;
  block: BlockState | null;
}

interface ColumnPlan {
  index: number;
  header: string;
  unit: MassUnit | undefined;
  /** Masses already read in this column, by cell text: records that wrote the same share one reading. */
  masses?: Map<string, NonNullable<MassValue>>;
}

interface WideFlush {
  flush: number;
  weight: ColumnPlan;
  date: ColumnPlan | null;
}

const absent: ColumnPlan = { index: -1, header: "", unit: undefined };

function shorten(value: string): string {
  return value.length > longestValueInReport ? `${value.slice(0, longestValueInReport)}…` : value;
}

function todayUtc(): string {
  return new Date().toISOString().slice(0, 10);
}

/**
 * A record as the parser makes it. A class rather than an object literal: in CPU profiles the
 * 22-field literal was the parser's most expensive line, and the constructor is not. Its
 * fields are SeasonRecord's, by declaration merging, so they are listed once.
 */
interface ParsedRecord extends SeasonRecord {}
class ParsedRecord {
  constructor(row: RowValues, flush: number | null, harvestedOn: string | null, fresh: MassValue, dry: MassValue) {
    this.line = row.line;
    this.blockCode = row.blockCode;
    this.strainCode = row.strainCode;
    this.substrate = row.substrate;
    this.trialCode = row.trialCode;
    this.arm = row.arm;
    this.inoculatedOn = row.inoculatedOn;
    this.wetBlockGrams = row.wet === null ? null : row.wet.grams;
    this.wetBlockAsWritten = row.wet === null ? null : row.wet.written;
    this.moisture = row.moisture;
    this.fruitingMethod = row.fruitingMethod;
    this.flush = flush;
    this.harvestedOn = harvestedOn;
    this.freshGrams = fresh === null ? null : fresh.grams;
    this.freshAsWritten = fresh === null ? null : fresh.written;
    this.dryGrams = dry === null ? null : dry.grams;
    this.dryAsWritten = dry === null ? null : dry.written;
    this.contaminated = row.contaminated === true;
    this.contaminatedOn = row.contaminatedOn;
    this.spentGrams = row.spent === null ? null : row.spent.grams;
    this.spentAsWritten = row.spent === null ? null : row.spent.written;
    this.notes = row.notes;
  }
}

/** Starts an incremental season-log reader: feed it the file in chunks of bytes or text. */
export function createSeasonLogParser(options: SeasonLogParserOptions = {}): SeasonLogParser {
  return new SeasonLogReader(options);
}

class SeasonLogReader implements SeasonLogParser {
  private readonly options: SeasonLogParserOptions;
  private readonly today: string;
  private readonly strains: StrainRegister | null;
  private readonly decoder = new ByteDecoder();
  private encoding: TextEncodingName | null = null;
  private sample = "";
  private tokenizer: CsvTokenizer | null = null;
  private stopped = false;
  private ended = false;
  private delimiter: Delimiter = ",";
  private decimal: DecimalMark = ".";
  private bytes = 0;
  private rows = 0;
  private headerLine = 0;
  private headerWidth = 0;
  private mapping: HeaderMapping = mapHeaders([]);
  private format: "long" | "wide" = "long";
  private readRows = true;
  private readonly plan = new Map<SeasonLogColumnName, ColumnPlan>();
  private columns: Readonly<Record<SeasonLogColumnName, ColumnPlan>> = columnsFrom(this.plan);
  private wide: WideFlush[] = [];
  private readonly records: SeasonRecord[] = [];
  private readonly issues: SeasonLogIssue[] = [];
  private readonly blocks = new Map<string, BlockState>();
  private readonly interned = new Map<string, string>();
  private readonly dates = new Map<string, DateReading>();
  private readonly strainChecks = new Map<string, string | null>();
  private readonly moistures = new Map<string, { fraction: number } | { error: string }>();
  private pendingDates = new Uint8Array(1024);
  private rowPendingDates = 0;
  private readonly current: RowValues = {
    line: 0,
    blockCode: "",
    strainCode: "",
    substrate: null,
    trialCode: null,
    arm: null,
    inoculatedOn: null,
    wet: null,
    moisture: null,
    fruitingMethod: null,
    contaminated: null,
    contaminatedOn: null,
    spent: null,
    notes: null,
    pendingDates: 0,
    block: null,
  };
  private dayFirstOnly = 0;
  private monthFirstOnly = 0;
  private firstDayFirst: { line: number; column: string; value: string } | null = null;
  private firstMonthFirst: { line: number; column: string; value: string } | null = null;
  private firstEither: { line: number; column: string; value: string } | null = null;
  private readonly rowsAboveHeader: { line: number; text: string }[] = [];
  private readonly onRow = (cells: string[], line: number) => this.row(cells, line);

  constructor(options: SeasonLogParserOptions) {
    this.options = options;
    this.today = options.today !== undefined && isoDay.test(options.today) ? options.today : todayUtc();
    this.strains = options.knownStrains === undefined ? null : new StrainRegister(options.knownStrains);
  }

  write(chunk: string | Uint8Array): void {
    if (this.ended) return;
    this.bytes += chunk.length;
    this.text(this.decodeChunk(chunk), false);
  }

  end(): SeasonLogResult {
    if (!this.ended) {
      this.ended = true;
      this.text(this.encoding === null || this.encoding === "text" ? "" : this.decoder.decode(new Uint8Array(0), true), true);
      this.finish();
      this.options.onProgress?.({ bytes: this.bytes, rows: this.rows });
    }
    return {
      records: this.records,
      issues: this.issues,
      detected: {
        encoding: this.encoding ?? "utf-8",
        delimiter: this.delimiter,
        decimal: this.decimal,
        dateOrder: this.decidedOrder,
        format: this.format,
        mapping: this.mapping,
      },
    };
  }

  private decidedOrder: DateOrder | "ambiguous" | null = null;

  private decodeChunk(chunk: string | Uint8Array): string {
    if (typeof chunk === "string") {
      this.encoding ??= "text";
      return this.encoding === "text" && this.bytes === chunk.length && chunk.charCodeAt(0) === 0xfeff ? chunk.slice(1) : chunk;
    }
    const text = this.decoder.decode(chunk, false);
    this.encoding = this.decoder.encoding;
    return text;
  }

  private report(line: number, severity: SeasonLogIssue["severity"], message: string, column?: string, value?: string): void {
    const issue: SeasonLogIssue = { line, severity, message };
    if (column !== undefined) issue.column = column;
    if (value !== undefined) issue.value = shorten(value);
    this.issues.push(issue);
  }

  private cellIssue(line: number, column: ColumnPlan, value: string, severity: SeasonLogIssue["severity"], what: string): void {
    this.report(line, severity, `Line ${line}, column "${column.header}": ${what}`, column.header, value);
  }

  private text(text: string, final: boolean): void {
    if (this.stopped) return;
    if (this.tokenizer === null) {
      this.sample += text;
      if (this.sample.length < sniffLength && !final) return;
      const sample = this.sample;
      this.sample = "";
      this.start(sample, final)?.push(sample, final, this.onRow);
      return;
    }
    this.tokenizer.push(text, final, this.onRow);
  }

  /** Sniffs the start of the file; null when the file is not a CSV at all. */
  private start(sample: string, final: boolean): CsvTokenizer | null {
    if (sample.trim() === "") {
      this.stopped = true;
      return null;
    }
    const control = sample.match(controlCharacters)?.length ?? 0;
    if (sample.includes("\u0000") || control > sample.length / 100) {
      this.stopped = true;
      this.report(
        1,
        "error",
        "The file is not a CSV text file (it holds binary data). Open the season log in your spreadsheet, save or export it as CSV, and upload that file.",
      );
      return null;
    }
    this.delimiter = sniffDelimiter(sample, final);
    this.decimal = this.options.decimal ?? sniffDecimal(sampleRows(sample, this.delimiter, final), this.delimiter);
    this.tokenizer = new CsvTokenizer(this.delimiter);
    return this.tokenizer;
  }

  private row(cells: string[], line: number): void {
    let blank = true;
    for (const cell of cells) {
      if (cell.trim() !== "") {
        blank = false;
        break;
      }
    }
    if (blank) return;
    if (this.headerLine === 0) {
      this.header(cells, line);
      return;
    }
    this.rows++;
    const every = this.options.progressEvery ?? 10_000;
    if (this.options.onProgress !== undefined && this.rows % every === 0) this.options.onProgress({ bytes: this.bytes, rows: this.rows });
    if (this.readRows) this.dataRow(cells, line);
  }

  private header(cells: string[], line: number): void {
    let width = cells.length;
    while (width > 0 && cells[width - 1].trim() === "") width--;
    const headers = cells.slice(0, width).map((cell) => cell.trim());
    const mapped = mapHeaders(headers, this.options.mapping);
    const { badTargets, ...mapping } = mapped;
    const matchesNothing = mapping.columns.every((column) => column.target === null || column.target === "ignore");
    // Sheets often carry a title or a farm name above the header: look a few rows further down.
    if (matchesNothing && this.rowsAboveHeader.length < mostRowsAboveHeader) {
      this.rowsAboveHeader.push({ line, text: headers.join(" ") });
      return;
    }
    if (matchesNothing && this.rowsAboveHeader.length > 0) {
      const first = this.rowsAboveHeader[0];
      this.headerLine = first.line;
      this.readRows = false;
      this.report(
        first.line,
        "error",
        `Line ${first.line} should name the columns, but none of the first ${mostRowsAboveHeader + 1} rows names a season-log column (the first starts "${shorten(first.text)}"). Put the column names in the first row (block_id, strain, flush, fresh_weight …; download the template to see them), or choose the columns in the mapping step.`,
      );
      return;
    }
    if (this.rowsAboveHeader.length > 0) {
      const lines = this.rowsAboveHeader.map((row) => row.line).join(", ");
      this.report(
        this.rowsAboveHeader[0].line,
        "warning",
        `Line${this.rowsAboveHeader.length > 1 ? "s" : ""} ${lines} above the header on line ${line} name no season-log columns and were skipped (the first says "${shorten(this.rowsAboveHeader[0].text)}"). If they hold data, move the header to the top.`,
      );
    }
    this.headerLine = line;
    this.headerWidth = width;
    this.mapping = mapping;
    for (const target of badTargets) {
      this.report(
        line,
        "error",
        `The column mapping names "${shorten(target)}", which is not a column of the season-log schema. Choose one of the schema's columns (such as block_id or fresh_weight), or "ignore".`,
      );
    }
    const wide = new Map<number, WideFlush>();
    const dateColumns = new Map<number, ColumnPlan>();
    for (const column of mapping.columns) {
      if (column.target === null || column.target === "ignore") continue;
      const plan: ColumnPlan = { index: column.position - 1, header: column.header, unit: column.unit ?? this.options.defaultMassUnit };
      const flush = /^flush_(\d+)(_date)?$/.exec(column.target);
      if (flush === null) this.plan.set(column.target as SeasonLogColumnName, plan);
      else if (flush[2] === undefined) wide.set(Number(flush[1]), { flush: Number(flush[1]), weight: plan, date: null });
      else dateColumns.set(Number(flush[1]), plan);
    }
    for (const [flush, date] of dateColumns) {
      const weight = wide.get(flush);
      if (weight === undefined)
        this.report(
          line,
          "warning",
          `Line ${line}, column "${date.header}": a harvest-date column for flush ${flush}, but no weight column for that flush, so its dates are ignored. Add a "Flush ${flush}" weight column, or map this column to "ignore".`,
          date.header,
        );
      else weight.date = date;
    }
    this.wide = [...wide.values()].sort((a, b) => a.flush - b.flush);
    this.columns = columnsFrom(this.plan);
    for (const missing of mapping.missingRequired) {
      this.readRows = false;
      const words = missing === "block_id" ? "the block code" : "the strain";
      this.report(
        line,
        "error",
        `No column holds ${words}. Name a column "${missing}" (or ${missing === "block_id" ? '"Block"' : '"Strain"'}) in the header on line ${line}, or choose the column in the mapping step.`,
      );
    }
    if (this.wide.length > 0) {
      this.format = "wide";
      const longColumns = (["flush", "fresh_weight", "harvested_on"] as const).filter((name) => this.plan.has(name));
      if (longColumns.length > 0) {
        this.readRows = false;
        this.report(
          line,
          "error",
          `The header on line ${line} has both one column per flush (such as "${this.wide[0].weight.header}") and the column "${this.plan.get(longColumns[0])?.header}". Use one layout: either one row per harvest with flush and fresh_weight, or one column per flush. Map the extra columns to "ignore" if they are not needed.`,
        );
      }
      if (this.plan.has("dry_weight")) {
        this.report(
          line,
          "warning",
          `Line ${line}, column "${this.plan.get("dry_weight")?.header}": with one column per flush, a single dry weight cannot be given to a flush, so the column is ignored. Upload dry weights as one row per harvest.`,
          this.plan.get("dry_weight")?.header,
        );
        this.plan.delete("dry_weight");
        this.columns = columnsFrom(this.plan);
      }
      if (this.wide.every((flush) => flush.date === null)) {
        this.report(
          line,
          "warning",
          `The file has one column per flush and no harvest dates, so its flushes are stored without dates. If you have the dates, add a column per flush such as "Flush 1 date".`,
        );
      }
    } else if (this.plan.has("flush") !== this.plan.has("fresh_weight")) {
      this.readRows = false;
      const has = this.plan.has("flush") ? "flush" : "fresh_weight";
      const lacks = has === "flush" ? "fresh_weight" : "flush";
      this.report(
        line,
        "error",
        `The header on line ${line} has a "${has}" column but no "${lacks}" column, and a harvest needs both. Add the "${lacks}" column, or choose it in the mapping step.`,
      );
    }
    if (mapping.unmatched.length > 0) {
      const listed = mapping.unmatched
        .slice(0, 10)
        .map((header) => `"${shorten(header)}"`)
        .join(", ");
      const more = mapping.unmatched.length > 10 ? ` and ${mapping.unmatched.length - 10} more` : "";
      this.report(
        line,
        "warning",
        `Line ${line}: the columns ${listed}${more} match no season-log column, so their values are not imported. If one of them holds a schema column, choose it in the mapping step.`,
      );
    }
  }

  private column(name: SeasonLogColumnName): ColumnPlan {
    return this.columns[name];
  }

  private intern(text: string): string {
    const known = this.interned.get(text);
    if (known !== undefined) return known;
    const copy = ownCopy(text);
    if (this.interned.size < mostInternedTexts) this.interned.set(copy, copy);
    return copy;
  }

  private mass(cells: string[], column: ColumnPlan, line: number): MassValue {
    const text = cell(cells, column.index);
    if (text === "") return null;
    column.masses ??= new Map();
    const known = column.masses.get(text);
    if (known !== undefined) return known;
    const reading = readMass(text, { defaultUnit: column.unit, decimal: this.decimal });
    if ("error" in reading) {
      this.cellIssue(line, column, text, "error", reading.error);
      return null;
    }
    const value = ownCopy(text);
    const mass = { grams: reading.grams, written: { value, unit: reading.unit } };
    if (column.masses.size < mostInternedTexts) column.masses.set(value, mass);
    return mass;
  }

  /** A date as "YYYY-MM-DD", or the text itself when it waits for the file's date order (flagged for the row). */
  private date(cells: string[], column: ColumnPlan, line: number, bit: number): string | null {
    const text = cell(cells, column.index);
    if (text === "") return null;
    let reading = this.dates.get(text);
    if (reading === undefined) {
      reading = readDate(text);
      if (reading.kind !== "date" && reading.kind !== "error") this.dates.set(ownCopy(text), reading);
      else if (this.dates.size < mostCachedDates) this.dates.set(ownCopy(text), reading);
    }
    switch (reading.kind) {
      case "date":
        return reading.iso;
      case "error":
        this.cellIssue(line, column, text, "error", reading.error);
        return null;
      case "either":
        this.firstEither ??= { line, column: column.header, value: text };
        break;
      case "dmy-only":
        this.dayFirstOnly++;
        this.firstDayFirst ??= { line, column: column.header, value: text };
        break;
      case "mdy-only":
        this.monthFirstOnly++;
        this.firstMonthFirst ??= { line, column: column.header, value: text };
        break;
    }
    this.rowPendingDates |= bit;
    return ownCopy(text);
  }

  private optionalText(cells: string[], column: ColumnPlan): string | null {
    const text = cell(cells, column.index);
    return text === "" ? null : this.intern(text);
  }

  private dataRow(cells: string[], line: number): void {
    for (let index = 0; index < cells.length; index++) {
      if (cells[index].length > longestCell) {
        const header = index < this.headerWidth ? this.mapping.columns[index].header : `(column ${index + 1})`;
        this.report(
          line,
          "error",
          `Line ${line}, column "${header}": the value is ${cells[index].length} characters long; a season-log cell holds at most ${longestCell}. Check that this is the season log exported as CSV, and shorten the cell.`,
          header,
          cells[index],
        );
        cells[index] = "";
      }
    }
    if (cells.length > this.headerWidth) {
      for (let index = this.headerWidth; index < cells.length; index++) {
        if (cells[index].trim() !== "") {
          this.report(
            line,
            "warning",
            `Line ${line}, column ${index + 1}: the value "${shorten(cells[index].trim())}" is beyond the last column of the header, so it is not imported. Give the column a header, or delete the value.`,
            `(column ${index + 1})`,
            cells[index].trim(),
          );
          break;
        }
      }
    }
    const blockColumn = this.column("block_id");
    const blockText = cell(cells, blockColumn.index);
    if (blockText === "")
      this.cellIssue(
        line,
        blockColumn,
        "",
        "error",
        "the block code is missing. Every row needs the code of its block: fill it in, or delete the row.",
      );
    this.rowPendingDates = 0;
    const strainColumn = this.column("strain");
    const strainText = cell(cells, strainColumn.index);
    let strainCode = strainText;
    if (strainText === "")
      this.cellIssue(
        line,
        strainColumn,
        "",
        "error",
        "the strain is missing. Write the strain code (for example PO-03) on every row of the block.",
      );
    else strainCode = this.strain(strainText, line, strainColumn);
    const row = this.current;
    row.line = line;
    row.block = blockText === "" ? null : this.blockState(blockText, line);
    row.blockCode = row.block === null ? "" : row.block.code;
    row.strainCode = strainCode;
    row.pendingDates = 0;
    row.inoculatedOn = this.date(cells, this.column("inoculated_on"), line, inoculatedBit);
    row.wet = this.mass(cells, this.column("block_wet_weight"), line);
    row.moisture = this.moisture(cells, line);
    const contaminatedColumn = this.column("contaminated");
    const contaminatedText = cell(cells, contaminatedColumn.index);
    const flag = parseYesNo(contaminatedText);
    row.contaminated = null;
    if ("error" in flag) this.cellIssue(line, contaminatedColumn, contaminatedText, "error", flag.error);
    else row.contaminated = flag.value;
    row.contaminatedOn = this.date(cells, this.column("contaminated_on"), line, contaminatedOnBit);
    row.spent = this.mass(cells, this.column("spent_weight"), line);
    row.substrate = this.optionalText(cells, this.column("substrate"));
    row.trialCode = this.optionalText(cells, this.column("trial"));
    row.arm = this.optionalText(cells, this.column("arm"));
    row.fruitingMethod = this.optionalText(cells, this.column("fruiting_method"));
    const notesText = cell(cells, this.column("notes").index);
    row.notes = notesText === "" ? null : ownCopy(notesText);
    row.pendingDates = this.rowPendingDates;
    const first = this.records.length;
    if (this.format === "wide") {
      for (const wideFlush of this.wide) {
        if (cell(cells, wideFlush.weight.index) === "") continue;
        const fresh = this.mass(cells, wideFlush.weight, line);
        this.rowPendingDates = 0;
        const harvestedOn = wideFlush.date === null ? null : this.date(cells, wideFlush.date, line, harvestedBit);
        this.addRecord(wideFlush.flush, harvestedOn, fresh, null, this.rowPendingDates);
      }
      if (this.records.length === first) this.addRecord(null, null, null, null, 0);
    } else {
      this.harvestRow(cells, line);
    }
    if (row.block !== null) this.compareBlock(row.block, first, line, row.contaminated);
  }

  private addRecord(flush: number | null, harvestedOn: string | null, fresh: MassValue, dry: MassValue, harvestPendingDates: number): void {
    const row = this.current;
    const record = new ParsedRecord(row, flush, harvestedOn, fresh, dry);
    const index = this.records.length;
    this.records.push(record);
    const pending = row.pendingDates | harvestPendingDates;
    if (pending !== 0) {
      if (index >= this.pendingDates.length) {
        const grown = new Uint8Array(this.pendingDates.length * 2);
        grown.set(this.pendingDates);
        this.pendingDates = grown;
      }
      this.pendingDates[index] = pending;
    }
    if (row.block !== null && flush !== null) this.addFlush(row.block, record, flush, row.line);
  }

  private harvestRow(cells: string[], line: number): void {
    const flushColumn = this.column("flush");
    const freshColumn = this.column("fresh_weight");
    const flushText = cell(cells, flushColumn.index);
    const freshText = cell(cells, freshColumn.index);
    this.rowPendingDates = 0;
    const harvestedOn = this.date(cells, this.column("harvested_on"), line, harvestedBit);
    const harvestPendingDates = this.rowPendingDates;
    const dry = this.mass(cells, this.column("dry_weight"), line);
    if (flushText === "" && freshText === "") {
      if (harvestedOn !== null || dry !== null) {
        const column = harvestedOn !== null ? this.column("harvested_on") : this.column("dry_weight");
        const value = cell(cells, column.index);
        this.cellIssue(
          line,
          column,
          value,
          "error",
          `"${shorten(value)}" belongs to a harvest, but the row has no flush number and no fresh weight. Fill in the flush and the fresh weight, or clear this cell if the row is only the block.`,
        );
      }
      this.addRecord(null, null, null, null, 0);
      return;
    }
    let flush: number | null = null;
    if (flushText === "") {
      this.cellIssue(
        line,
        flushColumn,
        "",
        "error",
        `the flush number is missing, but the row has a fresh weight ("${shorten(freshText)}"). Write which flush this is (1, 2, 3 …), or clear the weight if the row is only the block.`,
      );
    } else {
      const match = flushNumber.exec(flushText);
      if (match === null || Number(match[1]) < 1) {
        this.cellIssue(
          line,
          flushColumn,
          flushText,
          "error",
          `"${shorten(flushText)}" is not a flush number. Write 1 for the first flush, 2 for the second and so on.`,
        );
      } else flush = Number(match[1]);
    }
    let fresh: MassValue = null;
    if (freshText === "") {
      this.cellIssue(
        line,
        freshColumn,
        "",
        "error",
        `the fresh weight${flush === null ? "" : ` of flush ${flush}`} is missing. Enter what was picked, with its unit, or clear the flush number if the row is only the block.`,
      );
    } else fresh = this.mass(cells, freshColumn, line);
    this.addRecord(flush, harvestedOn, fresh, dry, harvestPendingDates);
  }

  private strain(text: string, line: number, column: ColumnPlan): string {
    if (this.strains === null) return this.intern(text);
    let known = this.strainChecks.get(text);
    if (known === undefined) {
      known = this.strains.find(text);
      if (this.strainChecks.size < mostInternedTexts) this.strainChecks.set(text, known);
    }
    if (known !== null) return known;
    const nearest = this.strains.nearest(text);
    const hint = nearest === null ? "Check the code against the co-op's strain list" : `Did you mean "${nearest}"? Correct the code`;
    this.cellIssue(
      line,
      column,
      text,
      "error",
      `"${shorten(text)}" is not a strain code of the co-op. ${hint}, or ask the coordinator to add the strain to the register.`,
    );
    return this.intern(text);
  }

  private moisture(cells: string[], line: number): number | null {
    const column = this.column("substrate_moisture");
    const text = cell(cells, column.index);
    if (text === "") return null;
    let reading = this.moistures.get(text);
    if (reading === undefined) {
      reading = parseMoisture(text, { decimal: this.decimal });
      if (this.moistures.size < mostInternedTexts) this.moistures.set(text, reading);
    }
    if ("error" in reading) {
      this.cellIssue(line, column, text, "error", reading.error);
      return null;
    }
    return reading.fraction;
  }

  private blockState(written: string, line: number): BlockState {
    let block = this.blocks.get(written);
    if (block === undefined) {
      const code = ownCopy(written);
      block = {
        code,
        firstLine: line,
        source: [-1, -1, -1, -1, -1, -1, -1, -1, -1, -1],
        contaminated: null,
        contaminatedLine: 0,
        harvests: noHarvests,
        freshGrams: 0,
      };
      this.blocks.set(code, block);
    }
    return block;
  }

  private addFlush(block: BlockState, record: SeasonRecord, flush: number, line: number): void {
    let earlier = -1;
    for (let index = 0; index < block.harvests.length; index += 2) if (block.harvests[index] === flush) earlier = block.harvests[index + 1];
    if (earlier !== -1) {
      const column = this.format === "wide" ? (this.wide.find((wide) => wide.flush === flush)?.weight ?? absent) : this.column("flush");
      this.cellIssue(
        line,
        column,
        String(flush),
        "error",
        `block ${record.blockCode} has flush ${flush} twice: on line ${earlier} and here. Delete the duplicate row, or correct the flush number.`,
      );
    } else {
      block.harvests = [...block.harvests, flush, line];
    }
    if (record.freshGrams !== null) block.freshGrams += record.freshGrams;
  }

  private compareBlock(block: BlockState, recordIndex: number, line: number, contaminated: boolean | null): void {
    const record = this.records[recordIndex];
    for (const rule of rowBlockAttributes) {
      if (record[rule.field] === null || (rule.field === "strainCode" && record.strainCode === "")) continue;
      const source = block.source[rule.slot];
      if (source === -1) {
        block.source[rule.slot] = recordIndex;
        continue;
      }
      const earlier = this.records[source];
      if (!rule.same(earlier, record)) this.disagreement(rule, record, earlier);
    }
    if (contaminated !== null) {
      if (block.contaminated === null) {
        block.contaminated = contaminated;
        block.contaminatedLine = line;
      } else if (block.contaminated !== contaminated) {
        const column = this.column("contaminated");
        this.cellIssue(
          line,
          column,
          contaminated ? "yes" : "no",
          "error",
          `block ${record.blockCode} is marked ${contaminated ? "contaminated" : "not contaminated"} here but ${block.contaminated ? "contaminated" : "not contaminated"} on line ${block.contaminatedLine}. A block's details must be the same on every row: correct one of them.`,
        );
      }
    }
    for (const rule of dateBlockAttributes) {
      if (record[rule.field] !== null && block.source[rule.slot] === -1) block.source[rule.slot] = recordIndex;
    }
  }

  private disagreement(rule: BlockAttributeRule, record: SeasonRecord, earlier: SeasonRecord): void {
    const column = this.column(rule.column);
    const value = rule.shown(record);
    this.cellIssue(
      record.line,
      column,
      value,
      "error",
      `block ${record.blockCode} has ${rule.words} "${shorten(value)}" here but "${shorten(rule.shown(earlier))}" on line ${earlier.line}. A block's details must be the same on every row: correct one of them.`,
    );
  }

  private decideDateOrder(): void {
    const given = this.options.dateOrder;
    if (given !== undefined) {
      this.decidedOrder = given;
      return;
    }
    if (this.dayFirstOnly > 0 && this.monthFirstOnly > 0) {
      if (this.dayFirstOnly === this.monthFirstOnly) {
        this.decidedOrder = "ambiguous";
        const dayFirst = this.firstDayFirst as { line: number; column: string; value: string };
        const monthFirst = this.firstMonthFirst as { line: number; column: string; value: string };
        this.report(
          dayFirst.line,
          "error",
          `The file mixes day-first dates (such as "${dayFirst.value}" on line ${dayFirst.line}) and as many month-first dates (such as "${monthFirst.value}" on line ${monthFirst.line}). Choose the date order for the file, then correct the dates that do not fit it.`,
          dayFirst.column,
          dayFirst.value,
        );
        return;
      }
      this.decidedOrder = this.dayFirstOnly > this.monthFirstOnly ? "dmy" : "mdy";
      return;
    }
    if (this.dayFirstOnly > 0) this.decidedOrder = "dmy";
    else if (this.monthFirstOnly > 0) this.decidedOrder = "mdy";
    else if (this.firstEither !== null) {
      this.decidedOrder = "ambiguous";
      const either = this.firstEither;
      const reading = this.dates.get(either.value) as { kind: "either"; dmy: string; mdy: string };
      this.report(
        either.line,
        "error",
        `Line ${either.line}, column "${either.column}": dates such as "${either.value}" can be read day-first (${reading.dmy}) or month-first (${reading.mdy}), and no date in the file settles which. Choose the date order, ${describeOrder("dmy")} or ${describeOrder("mdy")}, and read the file again.`,
        either.column,
        either.value,
      );
    }
  }

  private resolveDate(record: SeasonRecord, field: "inoculatedOn" | "harvestedOn" | "contaminatedOn", column: ColumnPlan): void {
    const text = record[field];
    if (text === null) return;
    const reading = this.dates.get(text) as DateReading;
    const order = this.decidedOrder;
    if (reading.kind === "either") {
      record[field] = order === "dmy" || order === "mdy" ? reading[order] : null;
      return;
    }
    if (reading.kind !== "dmy-only" && reading.kind !== "mdy-only") return;
    const only = reading.kind === "dmy-only" ? "dmy" : "mdy";
    if (order === "dmy" || order === "mdy") {
      if (only !== order) {
        if (this.firstReport(record.line, column)) this.cellIssue(record.line, column, text, "error", wrongOrderMessage(text, order));
        record[field] = null;
        return;
      }
    }
    record[field] = reading.iso;
  }

  private reportedLine = 0;
  private readonly reportedColumns = new Set<string>();

  /** True the first time a cell is named; the records of one wide-form row share their block cells. */
  private firstReport(line: number, column: ColumnPlan): boolean {
    if (line !== this.reportedLine) {
      this.reportedLine = line;
      this.reportedColumns.clear();
    }
    if (this.reportedColumns.has(column.header)) return false;
    this.reportedColumns.add(column.header);
    return true;
  }

  private harvestDateColumn(record: SeasonRecord): ColumnPlan {
    if (this.format === "long") return this.column("harvested_on");
    return this.wide.find((wide) => wide.flush === record.flush)?.date ?? absent;
  }

  private finish(): void {
    if (this.tokenizer?.unclosedQuoteLine != null) {
      const line = this.tokenizer.unclosedQuoteLine;
      this.report(
        line,
        "error",
        `Line ${line}: a quotation mark opened on this line is never closed, so the rest of the file was read as one value. Close the quote, or remove the stray quotation mark.`,
      );
    }
    if (this.headerLine === 0 && this.rowsAboveHeader.length > 0) {
      const first = this.rowsAboveHeader[0];
      this.report(
        first.line,
        "error",
        `Line ${first.line} should name the columns, but no row of the file names a season-log column (the first starts "${shorten(first.text)}"). Put the column names in the first row (block_id, strain, flush, fresh_weight …; download the template to see them), or choose the columns in the mapping step.`,
      );
    }
    if (this.headerLine === 0) {
      if (this.issues.length === 0)
        this.report(
          1,
          "error",
          "The file is empty. Export the season log from your spreadsheet as CSV (with the column names in the first row) and upload that file.",
        );
      this.issues.sort((a, b) => a.line - b.line);
      return;
    }
    if (this.rows === 0) {
      this.report(
        this.headerLine,
        "error",
        `The file has a header on line ${this.headerLine} but no rows below it. Add a row for each block or harvest, or check that you exported the right sheet.`,
      );
    }
    this.decideDateOrder();
    const wetWeightColumn = this.column("block_wet_weight");
    for (let index = 0; index < this.records.length; index++) {
      const record = this.records[index];
      const mask = index < this.pendingDates.length ? this.pendingDates[index] : 0;
      if (mask !== 0) {
        if (mask & inoculatedBit) this.resolveDate(record, "inoculatedOn", this.column("inoculated_on"));
        if (mask & contaminatedOnBit) this.resolveDate(record, "contaminatedOn", this.column("contaminated_on"));
        if (mask & harvestedBit) this.resolveDate(record, "harvestedOn", this.harvestDateColumn(record));
      }
    }
    this.reportedLine = 0;
    for (let index = 0; index < this.records.length; index++) {
      const record = this.records[index];
      const block = record.blockCode === "" ? undefined : this.blocks.get(record.blockCode);
      if (block !== undefined) this.blockAtFinish(block, record, index);
      this.futureDates(record);
      if (
        block !== undefined &&
        record.flush !== null &&
        record.freshGrams !== null &&
        record.wetBlockGrams !== null &&
        record.freshGrams > record.wetBlockGrams
      ) {
        const freshColumn =
          this.format === "wide" ? (this.wide.find((wide) => wide.flush === record.flush)?.weight ?? absent) : this.column("fresh_weight");
        const written = record.freshAsWritten?.value ?? "";
        this.cellIssue(
          record.line,
          freshColumn,
          written,
          "warning",
          `flush ${record.flush} of block ${record.blockCode} weighs ${formatMass(record.freshGrams, "metric")}, more than the whole wet block (${formatMass(record.wetBlockGrams, "metric")}${wetWeightColumn.index === -1 ? "" : `, column "${wetWeightColumn.header}"`}). Check the weight and its unit.`,
        );
      }
    }
    for (const [code, block] of this.blocks) this.blockTotals(code, block);
    this.issues.sort((a, b) => a.line - b.line);
    this.blocks.clear();
    this.interned.clear();
    this.dates.clear();
    this.moistures.clear();
    this.strainChecks.clear();
    for (const column of [...this.plan.values(), ...this.wide.map((wide) => wide.weight)]) column.masses = undefined;
    this.pendingDates = new Uint8Array(0);
  }

  private blockAtFinish(block: BlockState, record: SeasonRecord, index: number): void {
    for (const rule of dateBlockAttributes) {
      const source = block.source[rule.slot];
      if (record[rule.field] === null || source === -1 || source === index) continue;
      const earlier = this.records[source];
      if (earlier[rule.field] !== null && earlier.line !== record.line && !rule.same(earlier, record))
        this.disagreement(rule, record, earlier);
    }
    const source = block.source;
    const records = this.records;
    if (record.substrate === null && source[slot.substrate] !== -1) record.substrate = records[source[slot.substrate]].substrate;
    if (record.trialCode === null && source[slot.trialCode] !== -1) record.trialCode = records[source[slot.trialCode]].trialCode;
    if (record.arm === null && source[slot.arm] !== -1) record.arm = records[source[slot.arm]].arm;
    if (record.inoculatedOn === null && source[slot.inoculatedOn] !== -1)
      record.inoculatedOn = records[source[slot.inoculatedOn]].inoculatedOn;
    if (record.wetBlockGrams === null && source[slot.wetBlockGrams] !== -1) {
      record.wetBlockGrams = records[source[slot.wetBlockGrams]].wetBlockGrams;
      record.wetBlockAsWritten = records[source[slot.wetBlockGrams]].wetBlockAsWritten;
    }
    if (record.moisture === null && source[slot.moisture] !== -1) record.moisture = records[source[slot.moisture]].moisture;
    if (record.fruitingMethod === null && source[slot.fruitingMethod] !== -1)
      record.fruitingMethod = records[source[slot.fruitingMethod]].fruitingMethod;
    if (record.contaminatedOn === null && source[slot.contaminatedOn] !== -1)
      record.contaminatedOn = records[source[slot.contaminatedOn]].contaminatedOn;
    if (record.spentGrams === null && source[slot.spentGrams] !== -1) {
      record.spentGrams = records[source[slot.spentGrams]].spentGrams;
      record.spentAsWritten = records[source[slot.spentGrams]].spentAsWritten;
    }
    record.contaminated = block.contaminated ?? record.contaminatedOn !== null;
    if (record.harvestedOn !== null && record.inoculatedOn !== null && record.harvestedOn < record.inoculatedOn) {
      const column = this.harvestDateColumn(record);
      this.cellIssue(
        record.line,
        column,
        record.harvestedOn,
        "error",
        `flush ${record.flush} of block ${record.blockCode} was harvested on ${record.harvestedOn}, before the block was inoculated (${record.inoculatedOn}). Correct the harvest date or the inoculation date.`,
      );
    }
    if (block.contaminated === false && record.contaminatedOn !== null && block.source[slot.contaminatedOn] === index) {
      const column = this.column("contaminated_on");
      this.cellIssue(
        record.line,
        column,
        record.contaminatedOn,
        "warning",
        `block ${record.blockCode} has a contamination date (${record.contaminatedOn}) but is marked not contaminated on line ${block.contaminatedLine}. Mark it contaminated, or clear the date.`,
      );
    }
  }

  private futureDates(record: SeasonRecord): void {
    if (record.harvestedOn !== null && record.harvestedOn > this.today)
      this.futureDate(record, record.harvestedOn, this.harvestDateColumn(record), "harvest date");
    if (record.inoculatedOn !== null && record.inoculatedOn > this.today)
      this.futureDate(record, record.inoculatedOn, this.column("inoculated_on"), "inoculation date");
    if (record.contaminatedOn !== null && record.contaminatedOn > this.today)
      this.futureDate(record, record.contaminatedOn, this.column("contaminated_on"), "contamination date");
  }

  private futureDate(record: SeasonRecord, date: string, column: ColumnPlan, words: string): void {
    if (column.index === -1 || !this.firstReport(record.line, column)) return;
    this.cellIssue(
      record.line,
      column,
      date,
      "warning",
      `the ${words} ${date} is in the future (today is ${this.today}). Check the date; with day-first and month-first dates, also check the date order.`,
    );
  }

  private blockTotals(code: string, block: BlockState): void {
    const flushes = block.harvests.filter((_, index) => index % 2 === 0);
    if (flushes.length > 0) {
      const largest = Math.max(...flushes);
      const missing: number[] = [];
      for (let flush = 1; flush < largest; flush++) if (!flushes.includes(flush)) missing.push(flush);
      if (missing.length > 0) {
        const after = Math.min(...flushes.filter((flush) => flush > missing[0]));
        const line = block.harvests[block.harvests.indexOf(after) + 1];
        const column = this.format === "wide" ? (this.wide.find((wide) => wide.flush === after)?.weight ?? absent) : this.column("flush");
        const recorded = [...flushes].sort((a, b) => a - b).join(", ");
        this.cellIssue(
          line,
          column,
          String(after),
          "warning",
          `block ${code} has flushes ${recorded} but no flush ${missing.join(", ")}. Add the missing flush, or renumber the flushes.`,
        );
      }
    }
    const wetSource = block.source[slot.wetBlockGrams];
    const moistureSource = block.source[slot.moisture];
    if (wetSource === -1 || moistureSource === -1 || block.freshGrams === 0) return;
    const dryGrams = drySubstrateGrams(this.records[wetSource].wetBlockGrams as number, this.records[moistureSource].moisture as number);
    if (dryGrams <= 0 || block.freshGrams <= highestPlausibleEfficiency * dryGrams) return;
    const efficiency = Math.round((block.freshGrams / dryGrams) * 100);
    const column = this.format === "wide" ? (this.wide[0]?.weight ?? absent) : this.column("fresh_weight");
    this.cellIssue(
      block.firstLine,
      column,
      formatMass(block.freshGrams, "metric"),
      "warning",
      `block ${code} gave ${formatMass(block.freshGrams, "metric")} fresh in all from ${formatMass(dryGrams, "metric")} of dry substrate: a biological efficiency of ${efficiency} %, above the 250 % that blocks plausibly reach. Check this block's weights, their units and its moisture.`,
    );
  }
}

function columnsFrom(plan: ReadonlyMap<SeasonLogColumnName, ColumnPlan>): Record<SeasonLogColumnName, ColumnPlan> {
  const columns = {} as Record<SeasonLogColumnName, ColumnPlan>;
  for (const name of seasonLogColumnNames) columns[name] = plan.get(name) ?? absent;
  return columns;
}

// V8 keeps a substring of 13 or more characters as a view of the text it was cut from, so
// one note kept from each chunk would keep the whole file in memory; a copy lets the chunk go.
function ownCopy(text: string): string {
  return text.length < 13 ? text : (JSON.parse(JSON.stringify(text)) as string);
}

function cell(cells: readonly string[], index: number): string {
  return index < 0 || index >= cells.length ? "" : cells[index].trim();
}

/** Reads a whole season log (bytes or text) at once; see `createSeasonLogParser` for large files. */
export function parseSeasonLog(input: string | Uint8Array, options: SeasonLogOptions = {}): SeasonLogResult {
  const parser = createSeasonLogParser(options);
  const step = 1 << 20;
  for (let offset = 0; offset < input.length; offset += step) {
    parser.write(typeof input === "string" ? input.slice(offset, offset + step) : input.subarray(offset, offset + step));
  }
  return parser.end();
}
