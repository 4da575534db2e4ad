import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { generateSeasonLog } from "./generate";
import { parseSeasonLog } from "./index";

const valid = new TextEncoder().encode(generateSeasonLog({ rows: 40, seed: 5, style: "european" }));
const validText = generateSeasonLog({ rows: 40, seed: 9, style: "template" });
const awkward = [
  "",
  ";",
  ",",
  "\t",
  '"',
  '""',
  "\r",
  "\n",
  "\r\n",
  "\u0000",
  "\u00e9",
  "\ufffd",
  "-",
  "%",
  "lb",
  "oz",
  "31.02.2026",
  "03/04/2026",
  "60",
  "1e309",
  "NaN",
  "  ",
  "\ufeff",
];

function shape(result: ReturnType<typeof parseSeasonLog>): void {
  expect(Array.isArray(result.records)).toBe(true);
  for (const issue of result.issues) {
    expect(Number.isInteger(issue.line) && issue.line >= 1).toBe(true);
    expect(["error", "warning"]).toContain(issue.severity);
    expect(issue.message.length).toBeGreaterThan(20);
  }
  for (const record of result.records) {
    for (const grams of [record.wetBlockGrams, record.freshGrams, record.dryGrams, record.spentGrams]) {
      if (grams !== null) expect(Number.isFinite(grams) && grams >= 0).toBe(true);
    }
    if (record.moisture !== null) expect(record.moisture >= 0 && record.moisture <= 1).toBe(true);
  }
}

describe("random damage to a valid season log", () => {
  it("byte edits never throw, only report", () => {
    fc.assert(
      fc.property(
        fc.array(fc.record({ at: fc.nat(), byte: fc.integer({ min: 0, max: 255 }), kind: fc.constantFrom("set", "insert", "delete") }), {
          maxLength: 30,
        }),
        (edits) => {
          const bytes = [...valid];
          for (const edit of edits) {
            const at = edit.at % (bytes.length + 1);
            if (edit.kind === "set") bytes[at] = edit.byte;
            else if (edit.kind === "insert") bytes.splice(at, 0, edit.byte);
            else bytes.splice(at, 1);
          }
          shape(parseSeasonLog(new Uint8Array(bytes), { today: "2026-12-31" }));
        },
      ),
      { numRuns: 300 },
    );
  });

  it("text edits with awkward pieces, cut lines and swapped rows never throw, only report", () => {
    const lines = validText.split("\r\n");
    fc.assert(
      fc.property(
        fc.array(fc.record({ line: fc.nat(), at: fc.nat(), piece: fc.constantFrom(...awkward), swap: fc.nat() }), { maxLength: 20 }),
        fc.constantFrom(undefined, "dmy" as const, "mdy" as const),
        (edits, dateOrder) => {
          const edited = [...lines];
          for (const edit of edits) {
            const index = edit.line % edited.length;
            const text = edited[index];
            const at = edit.at % (text.length + 1);
            edited[index] = text.slice(0, at) + edit.piece + text.slice(at);
            const other = edit.swap % edited.length;
            [edited[index], edited[other]] = [edited[other], edited[index]];
          }
          shape(parseSeasonLog(edited.join("\r\n"), { dateOrder, knownStrains: ["PO-03"], today: "2026-12-31" }));
        },
      ),
      { numRuns: 300 },
    );
  });

  it("arbitrary text never throws", () => {
    fc.assert(
      fc.property(fc.string({ maxLength: 400 }), (text) => shape(parseSeasonLog(text))),
      { numRuns: 500 },
    );
  });
});
