import { describe, expect, it } from "vitest";
import { parseSeasonLog } from "../import";
import { demoStrains, generateSeasonLog } from "../import/generate";
import { packParse, stagingKey, unpackParse } from "./staged";

describe("the staged parse", () => {
  const key = stagingKey({ decimal: "," }, [...demoStrains], "2026-12-01");

  it("gives back every record, issue and detected setting the parse gave", () => {
    for (const style of ["template", "european", "imperial"] as const) {
      const text = `${generateSeasonLog({ rows: 400, seed: 7, style })}B-00001,NO-SUCH,,,,,,,1,,5 g,maybe,,,\r\n`;
      const parsed = parseSeasonLog(text, { knownStrains: [...demoStrains], today: "2026-12-01" });
      expect(parsed.issues.length).toBeGreaterThan(0);
      expect(unpackParse(packParse(key, parsed), key)).toEqual(parsed);
    }
  });

  it("is not used when the choices, the strain register or the day differ", () => {
    const packed = packParse(key, parseSeasonLog(generateSeasonLog({ rows: 10 }), { knownStrains: [...demoStrains] }));
    expect(unpackParse(packed, stagingKey({ decimal: "." }, [...demoStrains], "2026-12-01"))).toBeNull();
    expect(unpackParse(packed, stagingKey({ decimal: "," }, [...demoStrains, "PO-99"], "2026-12-01"))).toBeNull();
    expect(unpackParse(packed, stagingKey({ decimal: "," }, [...demoStrains], "2026-12-02"))).toBeNull();
    expect(unpackParse(packed, stagingKey({ decimal: "," }, [...demoStrains].reverse(), "2026-12-01"))).not.toBeNull();
    // A workbook's sheet and a column's decimal mark change what the file says.
    expect(unpackParse(packed, stagingKey({ decimal: ",", sheet: "Rooms" }, [...demoStrains], "2026-12-01"))).toBeNull();
    expect(
      unpackParse(packed, stagingKey({ decimal: ",", decimalByColumn: { "Fresh (g)": "." } }, [...demoStrains], "2026-12-01")),
    ).toBeNull();
  });
});
