import { createTokeniser, type TokeniserState, tokenise } from "./csv";
import { createDecoder, decodeBytes, type TextEncodingName } from "./decode";
import { todayUtc } from "./dates";
import { fileLevelIssues, finishRecords, groupRepeatedIssues } from "./finish";
import { report, shorten } from "./issues";
import { type RowAboveHeader, readHeaderRow } from "./layout";
import { readDataRow } from "./rows";
import { type Delimiter, looksBinary, sampleRows, sniffDecimal, sniffDelimiter } from "./sniff";
import { type ParseState, createParseState, emptyCaches } from "./state";
import { RegisterMatcher } from "./registers";
import { type WorkbookKind, readWorkbook } from "./spreadsheet";
import type {
  SeasonLogDetected,
  SeasonLogIssue,
  SeasonLogOptions,
  SeasonLogParser,
  SeasonLogParserOptions,
  SeasonLogResult,
} from "./types";

export type {
  MassAsWritten,
  SeasonLogDetected,
  SeasonLogIssue,
  SeasonLogOptions,
  SeasonLogParser,
  SeasonLogParserOptions,
  SeasonLogProgress,
  SeasonLogResult,
  SeasonRecord,
} from "./types";

const sniffLength = 64 * 1024;
const isoDay = /^\d{4}-\d{2}-\d{2}$/;

interface RowReader {
  state: ParseState;
  /** One row of cells; `numbers` marks cells a spreadsheet held as numbers. */
  row(cells: string[], line: number, numbers?: boolean[]): void;
  /** Data rows read so far. */
  rows(): number;
  finish(input: { unclosedQuoteLine: number | null; bytes: number }): {
    issues: SeasonLogIssue[];
    dateOrder: SeasonLogDetected["dateOrder"];
    ambiguousDecimalColumns: string[];
  };
}

/** Stages 3 to 6 over rows of cells, however the rows were read (CSV text or a spreadsheet's cells). */
function createRowReader(options: SeasonLogParserOptions): RowReader {
  const today = options.today !== undefined && isoDay.test(options.today) ? options.today : todayUtc();
  const state: ParseState = createParseState(
    options,
    today,
    options.knownStrains === undefined
      ? null
      : new RegisterMatcher(options.knownStrains.map((strain) => (typeof strain === "string" ? { code: strain } : strain))),
  );
  const every = options.progressEvery ?? 10_000;
  const rowsAboveHeader: RowAboveHeader[] = [];
  let rows = 0;
  let bytes = 0;
  return {
    state,
    rows: () => rows,
    row(cells, line, numbers) {
      let blank = true;
      for (const cell of cells) {
        if (cell.trim() !== "") {
          blank = false;
          break;
        }
      }
      if (blank) return;
      if (state.layout.headerLine === 0) {
        const outcome = readHeaderRow(cells, line, rowsAboveHeader, options);
        if (outcome.kind === "title") rowsAboveHeader.push(outcome.row);
        else {
          state.layout = outcome.layout;
          state.issues.push(...outcome.issues);
        }
        return;
      }
      rows++;
      if (options.onProgress !== undefined && rows % every === 0) options.onProgress({ bytes, rows });
      state.typedNumbers = numbers ?? null;
      if (state.layout.readRows) readDataRow(state, cells, line);
    },
    finish(input) {
      bytes = input.bytes;
      const headerLine = state.layout.headerLine;
      fileLevelIssues(state.issues, { unclosedQuoteLine: input.unclosedQuoteLine, headerLine, rowsAboveHeader, rows });
      let dateOrder: SeasonLogDetected["dateOrder"] = null;
      let ambiguousDecimalColumns: string[] = [];
      if (headerLine !== 0) {
        const decided = finishRecords(state);
        dateOrder = decided.dateOrder;
        ambiguousDecimalColumns = decided.ambiguousDecimalColumns;
        if (options.decimal === undefined && decided.fileMark !== null) state.decimal = decided.fileMark;
      }
      state.issues.sort((a, b) => a.line - b.line);
      state.issues = groupRepeatedIssues(state.issues);
      state.blocks.clear();
      state.caches = emptyCaches();
      state.pending = new Uint8Array(0);
      options.onProgress?.({ bytes, rows });
      return { issues: state.issues, dateOrder, ambiguousDecimalColumns };
    },
  };
}

/**
 * Starts an incremental season-log reader: feed it the file in chunks of bytes or text. It
 * runs the stages in turn — decode (decode.ts), sniff and tokenise (sniff.ts, csv.ts), map the
 * header (layout.ts), read the cells of each row (rows.ts) and check its block (blocks.ts) —
 * and at `end()` the end-of-file checks (finish.ts). Each stage is a function over plain data;
 * this function only holds where the file has got to.
 */
export function createSeasonLogParser(options: SeasonLogParserOptions = {}): SeasonLogParser {
  const reader = createRowReader(options);
  const { state } = reader;
  const decoder = createDecoder();
  let encoding: TextEncodingName | null = null;
  let delimiter: Delimiter = ",";
  let sample = "";
  let tokeniser: TokeniserState | null = null;
  let stopped = false;
  let ended = false;
  let bytes = 0;
  const onRow = (cells: string[], line: number): void => reader.row(cells, line);

  /** Sniffs the start of the file; null when the file is not a CSV at all. */
  const start = (text: string, final: boolean): TokeniserState | null => {
    if (text.trim() === "") {
      stopped = true;
      return null;
    }
    if (looksBinary(text)) {
      stopped = true;
      report(
        state.issues,
        1,
        "binary_file",
        "error",
        "The file is not a CSV text file (it holds binary data). Open the season log in your spreadsheet, save or export it as CSV, .xlsx or .ods, and upload that file.",
      );
      return null;
    }
    delimiter = sniffDelimiter(text, final);
    state.decimal = options.decimal ?? sniffDecimal(sampleRows(text, delimiter, final), delimiter);
    return createTokeniser(delimiter);
  };

  const text = (chunk: string, final: boolean): void => {
    if (stopped) return;
    if (tokeniser === null) {
      sample += chunk;
      if (sample.length < sniffLength && !final) return;
      const whole = sample;
      sample = "";
      tokeniser = start(whole, final);
      if (tokeniser !== null) tokenise(tokeniser, whole, final, onRow);
      return;
    }
    tokenise(tokeniser, chunk, final, onRow);
  };

  const decodeChunk = (chunk: string | Uint8Array): string => {
    if (typeof chunk === "string") {
      encoding ??= "text";
      return encoding === "text" && bytes === chunk.length && chunk.charCodeAt(0) === 0xfeff ? chunk.slice(1) : chunk;
    }
    const decoded = decodeBytes(decoder, chunk, false);
    encoding = decoder.encoding;
    return decoded;
  };

  let result: SeasonLogResult | null = null;
  return {
    write(chunk: string | Uint8Array): void {
      if (ended) return;
      bytes += chunk.length;
      text(decodeChunk(chunk), false);
    },
    end(): SeasonLogResult {
      if (result === null) {
        ended = true;
        text(encoding === null || encoding === "text" ? "" : decodeBytes(decoder, new Uint8Array(0), true), true);
        const finished = reader.finish({ unclosedQuoteLine: tokeniser?.unclosedQuoteLine ?? null, bytes });
        result = {
          records: state.records,
          issues: finished.issues,
          detected: {
            encoding: encoding ?? "utf-8",
            delimiter,
            decimal: state.decimal,
            dateOrder: finished.dateOrder,
            format: state.layout.format,
            mapping: state.layout.mapping,
            ...(finished.ambiguousDecimalColumns.length > 0 ? { ambiguousDecimalColumns: finished.ambiguousDecimalColumns } : {}),
          },
        };
      }
      return result;
    },
  };
}

/**
 * Reads a spreadsheet file (.xlsx or .ods) as a season log: the chosen sheet (`sheet`, else the
 * first), cell by cell with their types, through the same stages from the header on. A workbook
 * with several sheets and no sheet chosen gets an error asking which (`sheet_choice_needed`).
 */
export async function parseWorkbook(
  bytes: Uint8Array,
  kind: WorkbookKind,
  options: SeasonLogOptions & { sheet?: string } = {},
): Promise<SeasonLogResult> {
  const reader = createRowReader(options);
  const { state } = reader;
  const reading = await readWorkbook(bytes, kind, options.sheet, (row) => reader.row(row.cells, row.line, row.numbers));
  const detected = (workbook: NonNullable<SeasonLogDetected["workbook"]>): SeasonLogDetected => ({
    encoding: "utf-8",
    delimiter: ",",
    decimal: state.decimal,
    dateOrder: null,
    format: state.layout.format,
    mapping: state.layout.mapping,
    workbook,
  });
  if ("code" in reading) {
    report(state.issues, 1, reading.code, "error", reading.message);
    return { records: [], issues: state.issues, detected: detected({ kind, sheet: null, sheets: [] }) };
  }
  if (options.sheet !== undefined && reading.sheet === null) {
    const issues: SeasonLogIssue[] = [];
    report(
      issues,
      1,
      "sheet_choice_needed",
      "error",
      `The workbook has no sheet "${shorten(options.sheet)}"; its sheets are ${reading.sheets.map((name) => `"${shorten(name)}"`).join(", ")}. Choose the sheet that holds the season log.`,
    );
    return { records: [], issues, detected: detected({ kind, sheet: null, sheets: reading.sheets }) };
  }
  const finished = reader.finish({ unclosedQuoteLine: null, bytes: bytes.length });
  if (options.sheet === undefined && reading.sheets.length > 1) {
    report(
      finished.issues,
      1,
      "sheet_choice_needed",
      "error",
      `The workbook has ${reading.sheets.length} sheets (${reading.sheets.map((name) => `"${shorten(name)}"`).join(", ")}); the first, "${shorten(reading.sheet ?? "")}", is shown. Choose the sheet that holds the season log.`,
    );
    finished.issues.sort((a, b) => a.line - b.line);
  }
  return {
    records: state.records,
    issues: finished.issues,
    detected: {
      ...detected({ kind, sheet: reading.sheet, sheets: reading.sheets }),
      dateOrder: finished.dateOrder,
      ...(finished.ambiguousDecimalColumns.length > 0 ? { ambiguousDecimalColumns: finished.ambiguousDecimalColumns } : {}),
    },
  };
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
