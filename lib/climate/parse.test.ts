import { readFileSync } from "node:fs";
import { describe, expect, it } from "vitest";
import { fahrenheitToCelsius } from "../units/temperature";
import { type ClimateParseResult, parseClimateLog } from "./parse";

function fixture(name: string): Uint8Array {
  return new Uint8Array(readFileSync(new URL(`../../tests/fixtures/climate/${name}`, import.meta.url)));
}

function readings(result: ClimateParseResult) {
  if (!result.ok) throw new Error(`refused: ${JSON.stringify(result.issues)}`);
  return result.readings.map((reading) => ({ ...reading, at: new Date(reading.takenAt).toISOString() }));
}

function codes(result: ClimateParseResult): { line: number; code: string }[] {
  if (result.ok) throw new Error("read without a problem");
  return result.issues.map(({ line, code }) => ({ line, code }));
}

describe("°F to °C", () => {
  it("meets NIST SP 811 B.9's check values", () => {
    // NIST SP 811 (2008) B.9: t/°C = (t/°F − 32)/1.8; 32 °F = 0 °C, 212 °F = 100 °C, −40 °F = −40 °C, 98.6 °F = 37 °C.
    expect(fahrenheitToCelsius(32)).toBe(0);
    expect(fahrenheitToCelsius(212)).toBe(100);
    expect(fahrenheitToCelsius(-40)).toBe(-40);
    expect(fahrenheitToCelsius(98.6)).toBeCloseTo(37, 10);
  });
});

describe("logger shapes (tests/fixtures/climate/README.md)", () => {
  it("semicolon-separated, decimal comma, day.month.year, Europe/Berlin across the autumn change", () => {
    const result = parseClimateLog(fixture("semicolon-decimal-comma.csv"), { timeZone: "Europe/Berlin" });
    const read = readings(result);
    expect(result.ok && result.detected).toMatchObject({ delimiter: ";", decimal: ",", dateOrder: "dmy", temperatureUnit: "C" });
    expect(read).toHaveLength(15);
    // 24.10.2026 22:00 CEST (UTC+2) is 20:00 UTC; 17,5 °C and 95,0 % read with the decimal comma.
    expect(read[0]).toMatchObject({ at: "2026-10-24T20:00:00.000Z", temperatureC: 17.5, relativeHumidity: 95 });
    // 25.10.2026: clocks go back at 03:00 CEST to 02:00 CET. The file runs in time order, so its
    // first 02:00 and 02:30 are CEST (00:00, 00:30 UTC) and the second ones CET (01:00, 01:30 UTC).
    expect(read.slice(8, 13).map((reading) => reading.at)).toEqual([
      "2026-10-25T00:00:00.000Z",
      "2026-10-25T00:30:00.000Z",
      "2026-10-25T01:00:00.000Z",
      "2026-10-25T01:30:00.000Z",
      "2026-10-25T02:00:00.000Z",
    ]);
    expect(read[10].relativeHumidity).toBe(85.4);
  });

  it("comma-separated, °F, month/day/year with a 12-hour clock, America/Chicago", () => {
    const result = parseClimateLog(fixture("comma-fahrenheit-month-first-12-hour.csv"), { timeZone: "America/Chicago" });
    const read = readings(result);
    expect(result.ok && result.detected).toMatchObject({ delimiter: ",", decimal: ".", dateOrder: "mdy", temperatureUnit: "F" });
    expect(read).toHaveLength(16);
    // 03/13/2026 10:00:00 AM CDT (UTC−5, summer time since 8 March) is 15:00 UTC; 64.4 °F = 32.4/1.8 = 18 °C.
    expect(read[0]).toMatchObject({ at: "2026-03-13T15:00:00.000Z", temperatureC: 18, relativeHumidity: 92.5 });
    // 12:00:00 PM is noon (17:00 UTC), 01:00:00 PM is 13:00 (18:00 UTC).
    expect(read[2].at).toBe("2026-03-13T17:00:00.000Z");
    expect(read[3].at).toBe("2026-03-13T18:00:00.000Z");
  });

  it("lines above the header, separate date and time columns and a CO2 column", () => {
    const result = parseClimateLog(fixture("preamble-and-co2.csv"), { timeZone: "Europe/London" });
    const read = readings(result);
    expect(result.ok && result.detected).toMatchObject({ preambleLines: 3, hasCo2: true, temperatureUnit: "C" });
    // 2026-04-02 08:00:00 BST (UTC+1) is 07:00 UTC.
    expect(read[0]).toMatchObject({ at: "2026-04-02T07:00:00.000Z", temperatureC: 19.6, relativeHumidity: 93.1, co2Ppm: 1210 });
    expect(read).toHaveLength(12);
  });

  it("UTF-16 with a byte-order mark, tab-separated, as a spreadsheet's Unicode text export", () => {
    const result = parseClimateLog(fixture("utf16-tab-separated.csv"), { timeZone: "Pacific/Auckland" });
    const read = readings(result);
    expect(result.ok && result.detected).toMatchObject({ encoding: "utf-16le", delimiter: "\t", temperatureUnit: "C" });
    // 2026-05-10 06:00 NZST (UTC+12, no summer time in May) is 18:00 UTC the day before.
    expect(read[0]).toMatchObject({ at: "2026-05-09T18:00:00.000Z", temperatureC: 21, relativeHumidity: 88 });
    expect(read[7]).toMatchObject({ temperatureC: 22.75, relativeHumidity: 95 });
  });
});

describe("what is never guessed", () => {
  it("refuses a time the spring change skipped, naming its line", () => {
    // Europe/Berlin, 29 March 2026: clocks go from 02:00 CET straight to 03:00 CEST.
    const text =
      "Zeit;Temperatur (°C);Luftfeuchte (%)\n29.03.2026 01:30;18,0;90,0\n29.03.2026 02:30;18,0;90,0\n29.03.2026 03:30;18,0;90,0\n";
    expect(codes(parseClimateLog(text, { timeZone: "Europe/Berlin" }))).toEqual([{ line: 3, code: "time_in_gap" }]);
    // In a zone without summer time the same file reads.
    expect(readings(parseClimateLog(text, { timeZone: "Etc/GMT-1" }))[1].at).toBe("2026-03-29T01:30:00.000Z");
  });

  it("refuses the repeated hour when the file is not in time order", () => {
    const text =
      "Zeit;Temperatur (°C);Luftfeuchte (%)\n25.10.2026 03:00;18,0;90,0\n25.10.2026 02:30;18,0;90,0\n25.10.2026 01:30;18,0;90,0\n";
    expect(codes(parseClimateLog(text, { timeZone: "Europe/Berlin" }))).toEqual([{ line: 3, code: "repeated_hour_out_of_order" }]);
    // Out of order but with no repeated hour, the readings are sorted.
    const plain = "Zeit;Temperatur (°C);Luftfeuchte (%)\n24.10.2026 03:00;18,0;90,0\n24.10.2026 02:30;18,0;90,0\n";
    expect(readings(parseClimateLog(plain, { timeZone: "Europe/Berlin" })).map((reading) => reading.at)).toEqual([
      "2026-10-24T00:30:00.000Z",
      "2026-10-24T01:00:00.000Z",
    ]);
  });

  it("asks for the date order when every date reads both ways, and reads it once chosen", () => {
    const text = "Timestamp,Temperature (C),RH (%)\n03/04/2026 10:00,18.5,90.5\n03/04/2026 11:00,18.5,90.5\n";
    expect(codes(parseClimateLog(text, { timeZone: "UTC" }))).toEqual([{ line: 2, code: "ambiguous_date_order" }]);
    expect(readings(parseClimateLog(text, { timeZone: "UTC", dateOrder: "dmy" }))[0].at).toBe("2026-04-03T10:00:00.000Z");
  });

  it("refuses a date that only reads the other way than the file's", () => {
    const text = "Timestamp,Temperature (C),RH (%)\n13/04/2026 10:00,18.5,90.5\n14/04/2026 10:00,18.5,90.5\n04/15/2026 10:00,18.5,90.5\n";
    expect(codes(parseClimateLog(text, { timeZone: "UTC" }))).toEqual([{ line: 4, code: "date_wrong_order" }]);
  });

  it("asks for the decimal mark when a number reads two ways and nothing settles it", () => {
    // "1.250" ppm is 1.25 or 1 250; the other numbers have no mark.
    const text = "Timestamp;Temperature (C);RH (%);CO2 (ppm)\n2026-04-01 10:00;18;90;1.250\n";
    expect(codes(parseClimateLog(text, { timeZone: "UTC" }))).toEqual([{ line: 2, code: "ambiguous_decimal_mark" }]);
    expect(readings(parseClimateLog(text, { timeZone: "UTC", decimal: "," }))[0].co2Ppm).toBe(1250);
    // With a decimal comma elsewhere in the file, "1.250" groups thousands.
    const settled = "Timestamp;Temperature (C);RH (%);CO2 (ppm)\n2026-04-01 10:00;18,5;90;1.250\n";
    expect(readings(parseClimateLog(settled, { timeZone: "UTC" }))[0]).toMatchObject({ temperatureC: 18.5, co2Ppm: 1250 });
  });

  it("refuses a file whose numbers use both marks", () => {
    const text = "Timestamp;Temperature (C);RH (%)\n2026-04-01 10:00;18,5;90\n2026-04-01 10:10;18.5;90\n";
    expect(codes(parseClimateLog(text, { timeZone: "UTC" }))).toEqual([{ line: 1, code: "mixed_decimal_marks" }]);
  });

  it("asks for the temperature unit when neither header nor cells name it", () => {
    const text = "Timestamp,Temperature,Humidity\n2026-04-01 10:00,65.3,90.5\n";
    expect(codes(parseClimateLog(text, { timeZone: "UTC" }))).toEqual([{ line: 1, code: "temperature_unit_unknown" }]);
    expect(readings(parseClimateLog(text, { timeZone: "UTC", temperatureUnit: "F" }))[0].temperatureC).toBe(18.5);
    // A unit in the cells settles it: "18.5°C".
    expect(
      readings(parseClimateLog("Timestamp,Temperature,Humidity\n2026-04-01 10:00,18.5°C,90.5%\n", { timeZone: "UTC" }))[0],
    ).toMatchObject({
      temperatureC: 18.5,
      relativeHumidity: 90.5,
    });
  });

  it("refuses a temperature no room has (a unit read wrong), humidity over 100 % and a time given twice", () => {
    const text = "Timestamp,Temperature (°C),RH (%)\n2026-04-01 10:00,65.3,90\n2026-04-01 10:10,18,101\n2026-04-01 10:10,18,95\n";
    expect(codes(parseClimateLog(text, { timeZone: "UTC" }))).toEqual([
      { line: 2, code: "temperature_implausible" },
      { line: 3, code: "humidity_out_of_range" },
      { line: 4, code: "same_time_twice" },
    ]);
  });

  it("refuses a timestamp without a time of day and a file with no usable header", () => {
    expect(codes(parseClimateLog("Timestamp,Temperature (°C),RH (%)\n2026-04-01,18,90\n", { timeZone: "UTC" }))).toEqual([
      { line: 2, code: "time_without_clock" },
    ]);
    expect(codes(parseClimateLog("a,b,c\n1,2,3\n", { timeZone: "UTC" }))).toEqual([{ line: 0, code: "header_not_found" }]);
  });

  it("takes an offset written in the file over the chosen zone", () => {
    const text = "Timestamp,Temperature (°C),RH (%)\n2026-04-01T10:00:00+02:00,18,90\n2026-04-01T10:10:00Z,18,90\n";
    expect(readings(parseClimateLog(text, { timeZone: "America/Chicago" })).map((reading) => reading.at)).toEqual([
      "2026-04-01T08:00:00.000Z",
      "2026-04-01T10:10:00.000Z",
    ]);
  });
});
