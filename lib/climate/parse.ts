import { createDecoder, decodeBytes, type TextEncodingName } from "../import/decode";
import { type DateOrder, type DateReading, readDate, wrongOrderMessage } from "../import/dates";
import { decideDateOrder } from "../import/finish";
import { createTokeniser, tokenise } from "../import/csv";
import { type Delimiter, looksBinary, sniffDelimiter } from "../import/sniff";
import type { DateEvidence } from "../import/state";
import { type DecimalMark, decimalEvidence, parseDecimalNumber } from "../units";
import { fahrenheitToCelsius } from "../units/temperature";
import { instantsAt } from "../time/wall-clock";
import { count } from "../words";

/**
 * Reads the CSV a small temperature / humidity (and CO2) data logger exports. The season log's
 * rules hold here too: decimal marks, date orders and units are never guessed (an unclear file is
 * refused with what to choose), and every problem names its line. Times are wall-clock times in
 * the zone the uploader says the logger's clock was in; a time the zone skipped is an error, and
 * the repeated autumn hour is read by file order only when the file runs in time order.
 */

export type TemperatureUnit = "C" | "F";

export interface ClimateParseOptions {
  /** The zone the logger's clock was set to (IANA name). */
  timeZone: string;
  dateOrder?: DateOrder;
  decimal?: DecimalMark;
  /** For a temperature column whose header names no unit. */
  temperatureUnit?: TemperatureUnit;
}

export interface ClimateReading {
  /** Milliseconds since the epoch. */
  takenAt: number;
  temperatureC: number | null;
  relativeHumidity: number | null;
  co2Ppm: number | null;
}

export const climateIssueCodes = [
  "binary_file",
  "empty_file",
  "unclosed_quote",
  "header_not_found",
  "time_column_missing",
  "values_missing",
  "temperature_unit_unknown",
  "temperature_unit_disagrees",
  "ambiguous_decimal_mark",
  "mixed_decimal_marks",
  "number_unreadable",
  "temperature_implausible",
  "humidity_out_of_range",
  "co2_out_of_range",
  "time_unreadable",
  "time_without_clock",
  "date_unreadable",
  "date_not_in_calendar",
  "date_serial_out_of_range",
  "date_wrong_order",
  "ambiguous_date_order",
  "mixed_date_orders",
  "time_in_gap",
  "repeated_hour_out_of_order",
  "same_time_twice",
  "no_rows",
] as const;

export type ClimateIssueCode = (typeof climateIssueCodes)[number];

export interface ClimateIssue {
  /** The file's physical line, 0 for the file as a whole. */
  line: number;
  code: ClimateIssueCode;
  message: string;
}

export interface ClimateFileDetected {
  encoding: TextEncodingName;
  delimiter: Delimiter;
  decimal: DecimalMark | null;
  dateOrder: DateOrder | null;
  temperatureUnit: TemperatureUnit | null;
  /** Lines above the header that were skipped (a logger's name, serial number, settings). */
  preambleLines: number;
  hasCo2: boolean;
  /** The layout in words, kept with the log: "semicolon-separated, decimal comma, day-first dates, 24-hour clock, °C". */
  shape: string;
}

export type ClimateParseResult =
  | { ok: true; readings: ClimateReading[]; detected: ClimateFileDetected }
  | { ok: false; issues: ClimateIssue[]; detected: Partial<ClimateFileDetected> };

/** The most problems listed; a file wrong on every line says so once per kind after this. */
const mostIssues = 50;
const rowsSearchedForHeader = 30;

// Plausible readings in a fruiting room: outside them a unit or column was surely read wrong.
const lowestTemperatureC = -40;
const highestTemperatureC = 60;
const highestCo2Ppm = 100_000;

function simplified(text: string): string {
  return text
    .normalize("NFKD")
    .replace(/[\u0300-\u036f]/g, "")
    .toLowerCase()
    .replace(/co₂/g, "co2")
    .trim();
}

type ColumnRole = "timestamp" | "date" | "time" | "temperature" | "humidity" | "co2";

/** What a header cell names; loggers write these in several languages and with units inside. */
function roleOf(header: string): ColumnRole | null {
  const text = simplified(header);
  if (text === "") return null;
  if (/\bco2\b|\bppm\b|kohlendioxid|carbon dioxide/.test(text)) return "co2";
  if (
    /\b(rh|r\.h\.|hr|rf|rel\.? ?hum|humidity|humidite|feuchte|luftfeuchte|luftfeuchtigkeit|humedad|umidita|vochtigheid)\b|%\s*rh|rh\s*%|feuchte/.test(
      text,
    )
  )
    return "humidity";
  if (/temp|°c|°f|\bcelsius\b|\bfahrenheit\b/.test(text)) return "temperature";
  if (
    /^(date ?\/? ?time|datetime|timestamp|time ?stamp|datum ?\/? ?(uhrzeit|zeit)|zeitstempel|horodatage|date et heure|fecha ?y ?hora|data ?e ?ora|tijdstip|recorded at|time \(.*\))$/.test(
      text,
    )
  )
    return "timestamp";
  if (/^(date|datum|fecha|data)$/.test(text)) return "date";
  if (/^(time|uhrzeit|zeit|heure|hora|ora|tijd)$/.test(text)) return "time";
  return null;
}

function unitInHeader(header: string): TemperatureUnit | null {
  const text = simplified(header);
  if (/°\s*f|\bdeg ?f\b|fahrenheit|\(f\)|\[f\]|_f\b/.test(text)) return "F";
  if (/°\s*c|\bdeg ?c\b|celsius|\(c\)|\[c\]|_c\b/.test(text)) return "C";
  return null;
}

interface Layout {
  headerLine: number;
  timestamp: number | null;
  date: number | null;
  time: number | null;
  temperature: number | null;
  humidity: number | null;
  co2: number | null;
  headers: string[];
}

function layoutOf(cells: readonly string[], line: number): Layout | null {
  const layout: Layout = {
    headerLine: line,
    timestamp: null,
    date: null,
    time: null,
    temperature: null,
    humidity: null,
    co2: null,
    headers: [...cells],
  };
  cells.forEach((cell, index) => {
    const role = roleOf(cell);
    if (role !== null && layout[role] === null) layout[role] = index;
  });
  // A lone "Time" or "Zeit" column holds the date as well.
  if (layout.timestamp === null && layout.date === null && layout.time !== null) {
    layout.timestamp = layout.time;
    layout.time = null;
  }
  const hasTime = layout.timestamp !== null || layout.date !== null;
  const hasValue = layout.temperature !== null || layout.humidity !== null;
  return hasTime && hasValue ? layout : null;
}

// A time of day at the end of a timestamp: "14:30", "14:30:00", "2:30:00 PM", "14.30".
const clockAtEnd = /^(.*?)[\sT,]+(\d{1,2})[:.](\d{2})(?:[:.](\d{2})(?:[.,]\d+)?)?\s*(am|pm|a\.m\.|p\.m\.)?$/i;
const clockAlone = /^(\d{1,2})[:.](\d{2})(?:[:.](\d{2})(?:[.,]\d+)?)?\s*(am|pm|a\.m\.|p\.m\.)?$/i;
// ISO 8601 with an offset: the file names the instant itself and no zone is needed.
const isoWithOffset = /^(\d{4})-(\d{2})-(\d{2})[T ](\d{2}):(\d{2})(?::(\d{2})(?:\.\d+)?)?\s*(z|[+-]\d{2}:?\d{2})$/i;

interface Clock {
  hour: number;
  minute: number;
  second: number;
  twelveHour: boolean;
}

function readClock(hours: string, minutes: string, seconds: string | undefined, halfDay: string | undefined): Clock | null {
  let hour = Number(hours);
  const minute = Number(minutes);
  const second = seconds === undefined ? 0 : Number(seconds);
  if (minute > 59 || second > 59) return null;
  if (halfDay !== undefined) {
    if (hour < 1 || hour > 12) return null;
    const afternoon = halfDay.toLowerCase().startsWith("p");
    hour = (hour % 12) + (afternoon ? 12 : 0);
    return { hour, minute, second, twelveHour: true };
  }
  return hour > 23 ? null : { hour, minute, second, twelveHour: false };
}

type TimeCell =
  | { kind: "wall"; date: DateReading; clock: Clock }
  | { kind: "instant"; at: number }
  | { kind: "error"; code: ClimateIssueCode; message: string };

function readTimeCell(dateText: string, timeText: string | null): TimeCell {
  const written = timeText === null ? dateText.trim() : `${dateText.trim()} ${timeText.trim()}`;
  const iso = isoWithOffset.exec(written);
  if (iso !== null) {
    const offset = iso[7].toLowerCase() === "z" ? "Z" : iso[7].replace(/^([+-]\d{2})(\d{2})$/, "$1:$2");
    const at = Date.parse(`${iso[1]}-${iso[2]}-${iso[3]}T${iso[4]}:${iso[5]}:${iso[6] ?? "00"}${offset}`);
    if (!Number.isNaN(at)) return { kind: "instant", at };
  }
  let datePart: string;
  let clock: Clock | null;
  if (timeText !== null) {
    const match = clockAlone.exec(timeText.trim());
    if (match === null)
      return {
        kind: "error",
        code: "time_unreadable",
        message: `"${timeText.trim()}" is not a time of day we can read; write it as 14:30 or 2:30 PM.`,
      };
    datePart = dateText.trim();
    clock = readClock(match[1], match[2], match[3], match[4]);
  } else {
    const match = clockAtEnd.exec(written);
    if (match === null)
      return {
        kind: "error",
        code: "time_without_clock",
        message: `"${written}" has no time of day. A logger's readings need one: export the time with the date (e.g. 21.03.2026 14:30).`,
      };
    datePart = match[1].trim();
    clock = readClock(match[2], match[3], match[4], match[5]);
  }
  if (clock === null) return { kind: "error", code: "time_unreadable", message: `"${written}" has a time of day that is not on a clock.` };
  const date = readDate(datePart);
  if (date.kind === "error") return { kind: "error", code: date.code, message: date.error };
  return { kind: "wall", date, clock };
}

interface Row {
  line: number;
  time: TimeCell;
  written: string;
  temperature: string;
  humidity: string;
  co2: string;
}

function cellAt(cells: readonly string[], index: number | null): string {
  return index === null ? "" : (cells[index] ?? "").trim();
}

// A unit written in the cell itself: "21.5 °C", "71.2%RH", "850 ppm".
const temperatureCell = /^(.*?)\s*(?:°\s*([cf])|([cf]))$/i;
const trailingUnit = /\s*(?:%\s*rh|%|rh|ppm)$/i;

function stripTemperatureUnit(text: string): { number: string; unit: TemperatureUnit | null } {
  const match = temperatureCell.exec(text);
  if (match === null) return { number: text, unit: null };
  return { number: match[1], unit: (match[2] ?? match[3]).toUpperCase() === "F" ? "F" : "C" };
}

/** The number a cell holds with its sign taken off (parseDecimalNumber reads unsigned numbers). */
function signed(text: string, decimal: DecimalMark): number | null {
  const negative = /^[-−]/.test(text);
  const value = parseDecimalNumber(negative ? text.slice(1).trim() : text, decimal);
  return value === null ? null : negative ? -value : value;
}

function describeDelimiter(delimiter: Delimiter): string {
  return delimiter === ";" ? "semicolon-separated" : delimiter === "\t" ? "tab-separated" : "comma-separated";
}

/**
 * Reads a whole logger file. Such files are small (a reading a minute for a year is half a million
 * rows, about 20 MB), so they are read in one piece.
 */
export function parseClimateLog(input: Uint8Array | string, options: ClimateParseOptions): ClimateParseResult {
  const issues: ClimateIssue[] = [];
  const refuse = (line: number, code: ClimateIssueCode, message: string) => {
    if (issues.length < mostIssues) issues.push({ line, code, message });
  };
  let encoding: TextEncodingName = "text";
  let text: string;
  if (typeof input === "string") text = input.replace(/^\uFEFF/, "");
  else {
    const decoder = createDecoder();
    text = decodeBytes(decoder, input, true);
    encoding = decoder.encoding;
  }
  if (text.trim() === "")
    return { ok: false, issues: [{ line: 0, code: "empty_file", message: "The file is empty." }], detected: { encoding } };
  if (looksBinary(text.slice(0, 65_536)))
    return {
      ok: false,
      issues: [
        { line: 0, code: "binary_file", message: "This is not a text file. Export the logger's readings as CSV (text) and upload that." },
      ],
      detected: { encoding },
    };

  const delimiter = sniffDelimiter(text.slice(0, 65_536), text.length <= 65_536);
  const tokeniser = createTokeniser(delimiter);
  const rows: { cells: string[]; line: number }[] = [];
  tokenise(tokeniser, text, true, (cells, line) => {
    if (cells.some((cell) => cell.trim() !== "")) rows.push({ cells, line });
  });
  if (tokeniser.unclosedQuoteLine !== null)
    refuse(tokeniser.unclosedQuoteLine, "unclosed_quote", `Line ${tokeniser.unclosedQuoteLine} opens a quote (") that is never closed.`);

  let layout: Layout | null = null;
  let headerIndex = 0;
  for (; headerIndex < Math.min(rows.length, rowsSearchedForHeader); headerIndex++) {
    layout = layoutOf(rows[headerIndex].cells, rows[headerIndex].line);
    if (layout !== null) break;
  }
  const detected: Partial<ClimateFileDetected> = { encoding, delimiter };
  if (layout === null) {
    refuse(
      0,
      "header_not_found",
      `No header row names both a time and a temperature or humidity column in the first ${rowsSearchedForHeader} rows. The header needs a time column (e.g. "Timestamp", or "Date" and "Time") and "Temperature (°C)" or "Humidity (%RH)"; rename the columns and upload again.`,
    );
    return { ok: false, issues, detected };
  }
  detected.preambleLines = headerIndex;
  detected.hasCo2 = layout.co2 !== null;

  // The temperature unit: from the header, else the uploader's choice; a cell's own unit must agree.
  let temperatureUnit: TemperatureUnit | null = null;
  if (layout.temperature !== null) {
    const header = layout.headers[layout.temperature];
    const fromHeader = unitInHeader(header);
    if (fromHeader !== null && options.temperatureUnit !== undefined && fromHeader !== options.temperatureUnit)
      refuse(
        layout.headerLine,
        "temperature_unit_disagrees",
        `The header "${header}" says °${fromHeader}, but °${options.temperatureUnit} was chosen. Choose "as the file says" or correct the header.`,
      );
    temperatureUnit = fromHeader ?? options.temperatureUnit ?? null;
    if (temperatureUnit === null) {
      const unitsInCells = new Set(
        rows
          .slice(headerIndex + 1)
          .map((row) => stripTemperatureUnit(cellAt(row.cells, layout.temperature)).unit)
          .filter((unit) => unit !== null),
      );
      if (unitsInCells.size === 1) temperatureUnit = [...unitsInCells][0];
      else
        refuse(
          layout.headerLine,
          "temperature_unit_unknown",
          `The temperature column "${header}" does not say °C or °F. Choose the unit the logger was set to, or write it in the header ("Temperature (°C)").`,
        );
    }
  }
  detected.temperatureUnit = temperatureUnit;

  const dataRows: Row[] = rows.slice(headerIndex + 1).map(({ cells, line }) => {
    const dateText = layout.timestamp !== null ? cellAt(cells, layout.timestamp) : cellAt(cells, layout.date);
    const timeText = layout.timestamp === null && layout.time !== null ? cellAt(cells, layout.time) : null;
    return {
      line,
      time: readTimeCell(dateText, timeText),
      written: timeText === null ? dateText : `${dateText} ${timeText}`,
      temperature: cellAt(cells, layout.temperature),
      humidity: cellAt(cells, layout.humidity),
      co2: cellAt(cells, layout.co2),
    };
  });
  if (dataRows.length === 0) {
    refuse(layout.headerLine, "no_rows", "The file has a header but no readings below it.");
    return { ok: false, issues, detected };
  }

  // Decimal marks: the uploader's choice, else what the numbers that read one way settle, per
  // column and then for the file; a number that reads two ways with nothing to settle it is refused.
  const numberColumns = ["temperature", "humidity", "co2"] as const;
  const evidence = { temperature: new Set<string>(), humidity: new Set<string>(), co2: new Set<string>() };
  const firstEither: Partial<Record<(typeof numberColumns)[number], { line: number; value: string }>> = {};
  for (const row of dataRows) {
    for (const column of numberColumns) {
      const cell = column === "temperature" ? stripTemperatureUnit(row[column]).number : row[column].replace(trailingUnit, "");
      const says = decimalEvidence(cell.replace(/^[-−]/, ""));
      if (says === "either") firstEither[column] ??= { line: row.line, value: row[column] };
      else if (says !== null) evidence[column].add(says);
    }
  }
  const fileMarks = new Set<string>();
  for (const column of numberColumns) {
    if (evidence[column].size > 1) {
      refuse(
        layout.headerLine,
        "mixed_decimal_marks",
        `The ${column} column has numbers with a decimal point and numbers with a decimal comma. Correct the ones that differ, or choose the decimal mark.`,
      );
    }
    for (const mark of evidence[column]) fileMarks.add(mark);
  }
  const markOf = (marks: Set<string>): DecimalMark | null => (marks.size === 1 ? ([...marks][0] === "," ? "," : ".") : null);
  const settled = (column: (typeof numberColumns)[number]): DecimalMark | null =>
    options.decimal ?? markOf(evidence[column]) ?? markOf(fileMarks);
  const decimalOf = { temperature: settled("temperature"), humidity: settled("humidity"), co2: settled("co2") };
  for (const column of numberColumns) {
    const either = firstEither[column];
    if (either !== undefined && decimalOf[column] === null)
      refuse(
        either.line,
        "ambiguous_decimal_mark",
        `Line ${either.line}: "${either.value}" can be read with a decimal point or as thousands, and no number in the file settles which. Choose the file's decimal mark.`,
      );
  }
  const fileDecimal = options.decimal ?? markOf(fileMarks);
  detected.decimal = fileDecimal;

  // The date order, as season logs settle it: the uploader's choice, else the dates that read one way.
  const dateEvidence: DateEvidence = { dayFirstOnly: 0, monthFirstOnly: 0, firstDayFirst: null, firstMonthFirst: null, firstEither: null };
  const timeColumn = layout.headers[layout.timestamp ?? layout.date ?? 0];
  for (const row of dataRows) {
    if (row.time.kind !== "wall") continue;
    const seen = { line: row.line, column: timeColumn, value: row.written };
    if (row.time.date.kind === "dmy-only") {
      dateEvidence.dayFirstOnly++;
      dateEvidence.firstDayFirst ??= seen;
    } else if (row.time.date.kind === "mdy-only") {
      dateEvidence.monthFirstOnly++;
      dateEvidence.firstMonthFirst ??= seen;
    } else if (row.time.date.kind === "either") dateEvidence.firstEither ??= seen;
  }
  const decided = decideDateOrder(dateEvidence, options.dateOrder, (written) => {
    const cell = readTimeCell(written, null);
    return cell.kind === "wall" ? cell.date : readDate(written);
  });
  if (decided.issue !== undefined)
    refuse(
      decided.issue.line,
      decided.issue.code === "mixed_date_orders" ? "mixed_date_orders" : "ambiguous_date_order",
      decided.issue.message,
    );
  const order = decided.order === "ambiguous" ? null : decided.order;
  detected.dateOrder = order;

  // Each row's wall-clock time, its instants in the zone, and its values.
  interface Candidate {
    line: number;
    written: string;
    instants: number[];
    values: Omit<ClimateReading, "takenAt">;
  }
  const candidates: Candidate[] = [];
  let twelveHour = false;
  for (const row of dataRows) {
    const values: Omit<ClimateReading, "takenAt"> = { temperatureC: null, relativeHumidity: null, co2Ppm: null };
    let instants: number[] = [];
    const time = row.time;
    if (time.kind === "error") refuse(row.line, time.code, `Line ${row.line}: ${time.message}`);
    else if (time.kind === "instant") instants = [time.at];
    else {
      twelveHour ||= time.clock.twelveHour;
      let iso: string | null = null;
      if (time.date.kind === "date") iso = time.date.iso;
      else if (time.date.kind === "either") iso = order === null ? null : time.date[order];
      else if (time.date.kind === "dmy-only" || time.date.kind === "mdy-only") {
        const only: DateOrder = time.date.kind === "dmy-only" ? "dmy" : "mdy";
        if (order === null || order === only) iso = time.date.iso;
        else refuse(row.line, "date_wrong_order", `Line ${row.line}: ${wrongOrderMessage(row.written, order)}`);
      }
      if (iso !== null) {
        const [year, month, day] = iso.split("-").map(Number);
        instants = instantsAt(
          { year, month, day, hour: time.clock.hour, minute: time.clock.minute, second: time.clock.second },
          options.timeZone,
        );
        if (instants.length === 0)
          refuse(
            row.line,
            "time_in_gap",
            `Line ${row.line}: "${row.written}" did not happen in ${options.timeZone}: the clocks went forward past it that night. Check the zone chosen for the logger's clock (a logger that ignores summer time keeps one offset all year: choose "UTC+1 all year" and the like), or correct the row.`,
          );
      }
    }
    if (row.temperature !== "" && temperatureUnit !== null) {
      const { number, unit } = stripTemperatureUnit(row.temperature);
      const mark = decimalOf.temperature;
      const value = mark === null && decimalEvidence(number) === "either" ? null : signed(number, mark ?? ".");
      if (unit !== null && unit !== temperatureUnit)
        refuse(
          row.line,
          "temperature_unit_disagrees",
          `Line ${row.line}: "${row.temperature}" is in °${unit}, but the column is in °${temperatureUnit}.`,
        );
      else if (value === null) {
        if (mark !== null || decimalEvidence(number) !== "either")
          refuse(row.line, "number_unreadable", `Line ${row.line}: "${row.temperature}" is not a temperature we can read.`);
      } else {
        // A logger writes tenths of a degree; four decimals of a degree Celsius keep every °F reading apart.
        const celsius = temperatureUnit === "F" ? Math.round(fahrenheitToCelsius(value) * 10_000) / 10_000 : value;
        if (celsius < lowestTemperatureC || celsius > highestTemperatureC)
          refuse(
            row.line,
            "temperature_implausible",
            `Line ${row.line}: ${row.temperature} °${temperatureUnit} is not a fruiting room's temperature. Check the unit (°C or °F) and the decimal mark.`,
          );
        else values.temperatureC = celsius;
      }
    }
    if (row.humidity !== "") {
      const number = row.humidity.replace(trailingUnit, "");
      const mark = decimalOf.humidity;
      const value = mark === null && decimalEvidence(number) === "either" ? null : signed(number, mark ?? ".");
      if (value === null) {
        if (mark !== null || decimalEvidence(number) !== "either")
          refuse(row.line, "number_unreadable", `Line ${row.line}: "${row.humidity}" is not a relative humidity we can read.`);
      } else if (value < 0 || value > 100)
        refuse(row.line, "humidity_out_of_range", `Line ${row.line}: a relative humidity of "${row.humidity}" is outside 0–100 %.`);
      else values.relativeHumidity = value;
    }
    if (row.co2 !== "") {
      const number = row.co2.replace(trailingUnit, "");
      const mark = decimalOf.co2;
      const value = mark === null && decimalEvidence(number) === "either" ? null : signed(number, mark ?? ".");
      if (value === null) {
        if (mark !== null || decimalEvidence(number) !== "either")
          refuse(row.line, "number_unreadable", `Line ${row.line}: "${row.co2}" is not a CO2 reading we can read.`);
      } else if (value < 0 || value > highestCo2Ppm)
        refuse(row.line, "co2_out_of_range", `Line ${row.line}: "${row.co2}" ppm of CO2 is outside 0–${highestCo2Ppm} ppm.`);
      else values.co2Ppm = value;
    }
    candidates.push({ line: row.line, written: row.written, instants, values });
  }
  if (
    !candidates.some((candidate) => candidate.values.temperatureC !== null || candidate.values.relativeHumidity !== null) &&
    issues.length === 0
  )
    refuse(layout.headerLine, "values_missing", "No row has a temperature or a humidity reading.");

  // The repeated autumn hour: in a file that runs in time order, each such time is the earliest
  // of its two instants after the reading before it. Otherwise file order says nothing, and the
  // rows are refused rather than guessed.
  let previous = -Infinity;
  let chronological = true;
  const chosen: (number | null)[] = [];
  for (const candidate of candidates) {
    if (candidate.instants.length === 0) {
      chosen.push(null);
      continue;
    }
    const next = candidate.instants.find((instant) => instant > previous);
    if (next === undefined) {
      chronological = false;
      break;
    }
    chosen.push(next);
    previous = next;
  }
  // Each row's instant: the chosen one in a file in time order, else its only one (null: refused above or here).
  const instantOf = (candidate: Candidate, index: number): number | null =>
    chronological ? (chosen[index] ?? null) : candidate.instants.length === 1 ? candidate.instants[0] : null;
  const readings: ClimateReading[] = [];
  const lineAt = new Map<number, number>();
  candidates.forEach((candidate, index) => {
    const takenAt = instantOf(candidate, index);
    if (takenAt === null) {
      if (candidate.instants.length > 1)
        refuse(
          candidate.line,
          "repeated_hour_out_of_order",
          `Line ${candidate.line}: "${candidate.written}" happened twice in ${options.timeZone} (the clocks went back that night), and the file is not in time order, so which one is meant cannot be told. Sort the file by time as the logger wrote it, or remove the row.`,
        );
      return;
    }
    const earlier = lineAt.get(takenAt);
    if (earlier !== undefined) {
      refuse(
        candidate.line,
        "same_time_twice",
        `Line ${candidate.line}: "${candidate.written}" is the same moment as line ${earlier}. Keep one of the two rows.`,
      );
      return;
    }
    lineAt.set(takenAt, candidate.line);
    readings.push({ takenAt, ...candidate.values });
  });
  readings.sort((a, b) => a.takenAt - b.takenAt);

  const shape = [
    describeDelimiter(delimiter),
    fileDecimal === "," ? "decimal comma" : fileDecimal === "." ? "decimal point" : null,
    order === null ? null : order === "dmy" ? "day-first dates" : "month-first dates",
    twelveHour ? "12-hour clock" : "24-hour clock",
    temperatureUnit === null ? null : `°${temperatureUnit}`,
    layout.co2 !== null ? "CO2" : null,
    headerIndex > 0 ? `${count(headerIndex, "line")} above the header` : null,
    encoding === "utf-16le" || encoding === "utf-16be" ? "UTF-16" : encoding === "utf-8-bom" ? "UTF-8 with BOM" : null,
  ]
    .filter((part) => part !== null)
    .join(", ");
  const complete: ClimateFileDetected = {
    encoding,
    delimiter,
    decimal: fileDecimal,
    dateOrder: order,
    temperatureUnit,
    preambleLines: headerIndex,
    hasCo2: layout.co2 !== null,
    shape,
  };
  if (issues.length > 0) return { ok: false, issues: issues.sort((a, b) => a.line - b.line), detected: complete };
  return { ok: true, readings, detected: complete };
}
