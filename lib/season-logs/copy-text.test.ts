import { describe, expect, it } from "vitest";
import { copyCell, copyChunks } from "./copy-text";

describe("rows in COPY text format", () => {
  it("writes null as \\N, booleans as t and f, numbers as PostgreSQL reads them", () => {
    expect([null, undefined, true, false, 0, 1250.5, 0.000001].map(copyCell)).toEqual(["\\N", "\\N", "t", "f", "0", "1250.5", "0.000001"]);
  });

  it("escapes the backslash, tab, newline and carriage return a grower's note may hold, and nothing else", () => {
    expect(copyCell("bag split\tat the seam\r\nsee C:\\photos")).toBe("bag split\\tat the seam\\r\\nsee C:\\\\photos");
    expect(copyCell("\\N")).toBe("\\\\N");
    expect(copyCell("Pleurotus « gris » 2,5 kg")).toBe("Pleurotus « gris » 2,5 kg");
  });

  it("refuses a number PostgreSQL would store as NaN or Infinity", () => {
    expect(() => copyCell(Number.NaN)).toThrow(/finite/);
    expect(() => copyCell(Number.POSITIVE_INFINITY)).toThrow(/finite/);
  });

  it("gives one line a row, tab-separated, in chunks that end at a line's end", () => {
    const rows = Array.from({ length: 1000 }, (_, index) => ({ code: `B-${index}`, grams: index * 10, note: index % 2 ? null : "a\tb" }));
    const chunks = [...copyChunks(rows, (row) => [row.code, row.grams, row.note], 1000)];
    expect(chunks.length).toBeGreaterThan(10);
    for (const chunk of chunks) expect(chunk.endsWith("\n")).toBe(true);
    const lines = chunks.join("").split("\n");
    expect(lines.pop()).toBe("");
    expect(lines).toHaveLength(1000);
    expect(lines[0]).toBe("B-0\t0\ta\\tb");
    expect(lines[1]).toBe("B-1\t10\t\\N");
  });

  it("gives nothing for no rows", () => {
    expect([...copyChunks([], () => [])]).toEqual([]);
  });
});
