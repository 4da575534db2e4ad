import { describe, expect, it } from "vitest";
import { parseDate, readDate, spreadsheetSerialToIso } from "./dates";

describe("readDate", () => {
  it("reads ISO, day-first, month-first, compact, named months and two-digit years", () => {
    expect(readDate("2026-03-21")).toEqual({ kind: "date", iso: "2026-03-21" });
    expect(readDate("2026-03-21T08:30:00Z")).toEqual({ kind: "date", iso: "2026-03-21" });
    expect(readDate("21.03.2026")).toEqual({ kind: "dmy-only", iso: "2026-03-21" });
    expect(readDate("21/03/2026")).toEqual({ kind: "dmy-only", iso: "2026-03-21" });
    expect(readDate("03/21/2026")).toEqual({ kind: "mdy-only", iso: "2026-03-21" });
    expect(readDate("03/04/2026")).toEqual({ kind: "either", dmy: "2026-04-03", mdy: "2026-03-04" });
    expect(readDate("04/04/2026")).toEqual({ kind: "date", iso: "2026-04-04" });
    expect(readDate("21.03.26")).toEqual({ kind: "dmy-only", iso: "2026-03-21" });
    expect(readDate("20260321")).toEqual({ kind: "date", iso: "2026-03-21" });
    expect(readDate("21-Mar-2026")).toEqual({ kind: "date", iso: "2026-03-21" });
    expect(readDate("March 21, 2026")).toEqual({ kind: "date", iso: "2026-03-21" });
  });

  it("rejects days that are not in the calendar", () => {
    for (const text of ["2026-02-29", "31.04.2026", "13/13/2026", "2026-13-01", "tomorrow", ""]) expect(readDate(text).kind).toBe("error");
    expect(readDate("2028-02-29")).toEqual({ kind: "date", iso: "2028-02-29" });
  });

  it("reads plausible spreadsheet serial numbers and rejects small ones", () => {
    expect(readDate("46102")).toEqual({ kind: "date", iso: "2026-03-21" });
    expect(readDate("46102.75")).toEqual({ kind: "date", iso: "2026-03-21" });
    expect(readDate("12").kind).toBe("error");
  });
});

describe("spreadsheetSerialToIso (1900 date system)", () => {
  it("counts serial 1 as 1900-01-01 and skips the fictitious 1900-02-29 (serial 60)", () => {
    expect(spreadsheetSerialToIso(1)).toBe("1900-01-01");
    expect(spreadsheetSerialToIso(59)).toBe("1900-02-28");
    expect(spreadsheetSerialToIso(60)).toBeNull();
    expect(spreadsheetSerialToIso(61)).toBe("1900-03-01");
    // Widely published anchors of the 1900 system: 25569 is the Unix epoch, 45000 is 2023-03-15.
    expect(spreadsheetSerialToIso(25569)).toBe("1970-01-01");
    expect(spreadsheetSerialToIso(45000)).toBe("2023-03-15");
    expect(spreadsheetSerialToIso(0)).toBeNull();
  });
});

describe("parseDate", () => {
  it("resolves ambiguous dates only with an order, and never guesses", () => {
    expect(parseDate("03/04/2026", "dmy")).toEqual({ iso: "2026-04-03" });
    expect(parseDate("03/04/2026", "mdy")).toEqual({ iso: "2026-03-04" });
    const guess = parseDate("03/04/2026");
    expect(guess).toHaveProperty("error");
    expect("error" in guess && guess.error).toContain("Choose the date order");
  });

  it("rejects a date that only reads in the other order", () => {
    const wrong = parseDate("03/21/2026", "dmy");
    expect("error" in wrong && wrong.error).toContain("only makes sense month-first");
    expect(parseDate("21/03/2026", "dmy")).toEqual({ iso: "2026-03-21" });
  });
});

describe("date-times as spreadsheets write them", () => {
  it("reads the day of 03/21/26 08:30 AM, 21.03.2026 08:30, 2026-03-21T08:30 and a serial with a fraction", () => {
    // LibreOffice Calc 7.4 CSV exports under en-US and de-DE (tests/fixtures/spreadsheets/README.md).
    expect(readDate("03/21/26 08:30 AM")).toEqual({ kind: "mdy-only", iso: "2026-03-21" });
    expect(readDate("03/21/26 04:45 PM")).toEqual({ kind: "mdy-only", iso: "2026-03-21" });
    expect(readDate("21.03.2026 08:30")).toEqual({ kind: "dmy-only", iso: "2026-03-21" });
    expect(readDate("21/03/2026 16:45:10")).toEqual({ kind: "dmy-only", iso: "2026-03-21" });
    expect(readDate("2026-03-21T08:30:00")).toEqual({ kind: "date", iso: "2026-03-21" });
    // 46102 is 2026-03-21 in the 1900 date system (Excel's DATE(2026,3,21)); .354166… is 08:30.
    expect(readDate("46102.3541666667")).toEqual({ kind: "date", iso: "2026-03-21" });
    expect(readDate("46102,35")).toEqual({ kind: "date", iso: "2026-03-21" });
    expect(readDate("03/04/26 10:00 PM")).toEqual({ kind: "either", dmy: "2026-04-03", mdy: "2026-03-04" });
  });

  it("refuses a time that is no time of day", () => {
    expect(readDate("21.03.2026 25:00").kind).toBe("error");
    expect(readDate("03/21/26 13:30 PM").kind).toBe("error");
    expect(readDate("21.03.2026 08:75").kind).toBe("error");
  });
});
