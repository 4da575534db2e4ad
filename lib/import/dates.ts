export type DateOrder = "dmy" | "mdy";

/** Why a date could not be read; the same codes name the problem in an import report. */
export type DateErrorCode = "date_unreadable" | "date_not_in_calendar" | "date_serial_out_of_range";

/**
 * What a date cell can mean. Numeric dates such as 03/04/2026 read differently day-first
 * and month-first, so the whole file's order is settled from the cells that only read one
 * way ("dmy-only" or "mdy-only") before the "either" cells are resolved.
 */
export type DateReading =
  | { kind: "date"; iso: string }
  | { kind: "dmy-only"; iso: string }
  | { kind: "mdy-only"; iso: string }
  | { kind: "either"; dmy: string; mdy: string }
  | { kind: "error"; code: DateErrorCode; error: string };

const isoDate = /^(\d{4})[-/.](\d{1,2})[-/.](\d{1,2})(?:[T ]\d{1,2}:\d{2}(?::\d{2}(?:\.\d+)?)?(?:Z|[+-]\d{2}:?\d{2})?)?$/i;
// A time of day as spreadsheets write it after a date: "08:30", "8:30:15", "08:30 AM", "4:45 p.m.".
// The time is read and dropped: the season log keeps days.
const timeOfDay = String.raw`(?:[ T]+(\d{1,2})[:.](\d{2})(?:[:.]\d{2}(?:[.,]\d+)?)?\s*(am|pm|a\.m\.|p\.m\.)?)?`;
const numericDate = new RegExp(String.raw`^(\d{1,2})([./-])(\d{1,2})\2(\d{4}|\d{2})${timeOfDay}$`);
const compactDate = /^(\d{4})(\d{2})(\d{2})$/;
const serialNumber = /^\d{1,6}(?:[.,]\d+)?$/;
const dayMonthName = /^(\d{1,2})[-\s./]*([a-z]{3,9})\.?[-\s./,]*(\d{4}|\d{2})$/;
const monthNameDay = /^([a-z]{3,9})\.?\s*(\d{1,2})(?:st|nd|rd|th)?,?\s*(\d{4})$/;

const monthNumbers: Readonly<Record<string, number>> = {
  jan: 1,
  january: 1,
  feb: 2,
  february: 2,
  mar: 3,
  march: 3,
  apr: 4,
  april: 4,
  may: 5,
  jun: 6,
  june: 6,
  jul: 7,
  july: 7,
  aug: 8,
  august: 8,
  sep: 9,
  sept: 9,
  september: 9,
  oct: 10,
  october: 10,
  nov: 11,
  november: 11,
  dec: 12,
  december: 12,
};

const millisecondsPerDay = 86_400_000;
// Serials in this range (1970-01-01 to 2099-12-31) are read as spreadsheet dates; a small
// number in a date column is far more likely a typing slip than a date in 1900.
const firstPlausibleSerial = 25_569;
const lastPlausibleSerial = 73_050;

const howToWrite = "Write dates as 2026-03-21 (year-month-day), or as the spreadsheet shows them, e.g. 21.03.2026.";

function pad(value: number, width: number): string {
  return String(value).padStart(width, "0");
}

function daysInMonth(year: number, month: number): number {
  return new Date(Date.UTC(year, month, 0)).getUTCDate();
}

/** "YYYY-MM-DD" for a real calendar day, or null. */
export function calendarDate(year: number, month: number, day: number): string | null {
  if (month < 1 || month > 12 || day < 1 || day > daysInMonth(year, month)) return null;
  return `${pad(year, 4)}-${pad(month, 2)}-${pad(day, 2)}`;
}

// Two-digit years are read as 2000–2099: a season log has no dates from the 1900s.
function fullYear(written: string): number {
  const year = Number(written);
  return written.length === 2 ? 2000 + year : year;
}

/**
 * Converts a spreadsheet serial day number (1900 date system) to "YYYY-MM-DD". Serial 1
 * is 1900-01-01. The 1900 system counts a 29 February 1900 that never existed (a bug
 * kept from Lotus 1-2-3 for compatibility), so serial 60 is no real day and serials from
 * 61 on are one day ahead of a plain count; both are handled here.
 */
export function spreadsheetSerialToIso(serial: number): string | null {
  const day = Math.floor(serial);
  if (!Number.isFinite(serial) || day < 1 || day === 60 || day > 2_958_465) return null;
  const epoch = day < 60 ? Date.UTC(1899, 11, 31) : Date.UTC(1899, 11, 30);
  return new Date(epoch + day * millisecondsPerDay).toISOString().slice(0, 10);
}

/** Reads one date cell without deciding the file's day/month order. */
export function readDate(text: string): DateReading {
  const written = text.trim().toLowerCase();
  let match = isoDate.exec(written);
  if (match !== null) {
    const iso = calendarDate(Number(match[1]), Number(match[2]), Number(match[3]));
    return iso === null ? notADay(text) : { kind: "date", iso };
  }
  match = numericDate.exec(written);
  if (match !== null && !validTime(match[5], match[6], match[7])) return notADay(text);
  if (match !== null) {
    const first = Number(match[1]);
    const second = Number(match[3]);
    const year = fullYear(match[4]);
    const dayFirst = calendarDate(year, second, first);
    const monthFirst = calendarDate(year, first, second);
    if (dayFirst !== null && monthFirst !== null) {
      return dayFirst === monthFirst ? { kind: "date", iso: dayFirst } : { kind: "either", dmy: dayFirst, mdy: monthFirst };
    }
    if (dayFirst !== null) return { kind: "dmy-only", iso: dayFirst };
    if (monthFirst !== null) return { kind: "mdy-only", iso: monthFirst };
    return notADay(text);
  }
  match = compactDate.exec(written);
  if (match !== null) {
    const iso = calendarDate(Number(match[1]), Number(match[2]), Number(match[3]));
    return iso === null ? notADay(text) : { kind: "date", iso };
  }
  if (serialNumber.test(written)) {
    const serial = Number(written.replace(",", "."));
    if (serial < firstPlausibleSerial || serial > lastPlausibleSerial) {
      return {
        kind: "error",
        code: "date_serial_out_of_range",
        error: `"${text.trim()}" is not a date. If it is a spreadsheet date number it falls outside 1970–2099; format the column as a date in the spreadsheet and export again. ${howToWrite}`,
      };
    }
    return { kind: "date", iso: spreadsheetSerialToIso(serial) as string };
  }
  match = dayMonthName.exec(written);
  if (match !== null) return namedMonth(text, match[3], match[2], match[1]);
  match = monthNameDay.exec(written);
  if (match !== null) return namedMonth(text, match[3], match[1], match[2]);
  return { kind: "error", code: "date_unreadable", error: `"${text.trim()}" is not a date we can read. ${howToWrite}` };
}

function validTime(hours: string | undefined, minutes: string | undefined, halfDay: string | undefined): boolean {
  if (hours === undefined) return true;
  const hour = Number(hours);
  if (Number(minutes) > 59) return false;
  return halfDay === undefined ? hour <= 24 : hour >= 1 && hour <= 12;
}

function namedMonth(text: string, year: string, monthName: string, day: string): DateReading {
  const month = monthNumbers[monthName];
  if (month === undefined)
    return { kind: "error", code: "date_unreadable", error: `"${text.trim()}" is not a date we can read. ${howToWrite}` };
  const iso = calendarDate(fullYear(year), month, Number(day));
  return iso === null ? notADay(text) : { kind: "date", iso };
}

function notADay(text: string): DateReading {
  return {
    kind: "error",
    code: "date_not_in_calendar",
    error: `"${text.trim()}" is not a day in the calendar. Check the day and month. ${howToWrite}`,
  };
}

/**
 * Reads one date cell to "YYYY-MM-DD" under a known order. Without an order, a date that
 * reads two ways is an error: we never guess.
 */
export function parseDate(text: string, order?: DateOrder): { iso: string } | { error: string } {
  const reading = readDate(text);
  switch (reading.kind) {
    case "date":
      return { iso: reading.iso };
    case "error":
      return { error: reading.error };
    case "either":
      if (order !== undefined) return { iso: reading[order] };
      return {
        error: `"${text.trim()}" can be read day-first (${reading.dmy}) or month-first (${reading.mdy}). Choose the date order for the file.`,
      };
    case "dmy-only":
    case "mdy-only": {
      const only = reading.kind === "dmy-only" ? "dmy" : "mdy";
      if (order === undefined || order === only) return { iso: reading.iso };
      return { error: wrongOrderMessage(text, order) };
    }
  }
}

export function describeOrder(order: DateOrder): string {
  return order === "dmy" ? "day-first (21/03/2026)" : "month-first (03/21/2026)";
}

export function wrongOrderMessage(text: string, order: DateOrder): string {
  const other: DateOrder = order === "dmy" ? "mdy" : "dmy";
  return `"${text.trim()}" only makes sense ${describeOrder(other)}, but the file's dates are ${describeOrder(order)}. Correct this date, or write it as 2026-03-21.`;
}

/** Today's date in UTC as YYYY-MM-DD, the form dates are stored and compared in. */
export function todayUtc(): string {
  return new Date().toISOString().slice(0, 10);
}
