import { describe, expect, it } from "vitest";
import { mapHeaders, readHeader } from "./headers";

describe("readHeader", () => {
  it("takes the unit out of the header", () => {
    expect(readHeader("Wet block (lb)")).toEqual({ name: "wetblock", unit: "lb" });
    expect(readHeader("fresh_weight_g")).toEqual({ name: "freshweight", unit: "g" });
    expect(readHeader("Dry [oz]")).toEqual({ name: "dry", unit: "oz" });
    expect(readHeader("Spent, in kg")).toEqual({ name: "spent", unit: "kg" });
    expect(readHeader("Moisture %")).toEqual({ name: "moisture", unit: null });
    expect(readHeader("Bag")).toEqual({ name: "bag", unit: null });
  });
});

describe("mapHeaders", () => {
  it("matches case- and punctuation-insensitively, with synonyms", () => {
    const mapping = mapHeaders(["Block ID", "STRAIN", "Wet block (lb)", "Moisture", "Inoculated", "Flush #", "Fresh weight (g)", "Shelf"]);
    expect(mapping.used).toEqual({
      "Block ID": "block_id",
      STRAIN: "strain",
      "Wet block (lb)": "block_wet_weight",
      Moisture: "substrate_moisture",
      Inoculated: "inoculated_on",
      "Flush #": "flush",
      "Fresh weight (g)": "fresh_weight",
    });
    expect(mapping.unmatched).toEqual(["Shelf"]);
    expect(mapping.certain).toBe(true);
  });

  it("knows the fruiting room by the trade's words, apart from the fruiting method", () => {
    for (const header of ["Fruiting room", "Room", "TENT", "Grow room", "fruiting_chamber"]) {
      expect(mapHeaders(["Block", "Strain", header, "Fruiting"]).used, header).toMatchObject({
        [header]: "fruiting_room",
        Fruiting: "fruiting_method",
      });
    }
    const loose = mapHeaders(["Block", "Strain", "Tub"]);
    expect(loose.used).toMatchObject({ Tub: "fruiting_room" });
    expect(loose.uncertain).toEqual(["Tub"]);
  });

  it("recognises wide-form flush columns and their dates", () => {
    const mapping = mapHeaders(["Bag", "Strain", "flush_1", "Flush 2 (oz)", "Flush 2 date", "3rd flush"]);
    expect(mapping.used).toMatchObject({
      flush_1: "flush_1",
      "Flush 2 (oz)": "flush_2",
      "Flush 2 date": "flush_2_date",
      "3rd flush": "flush_3",
    });
    expect(mapping.columns[3].unit).toBe("oz");
  });

  it("marks loose names and near spellings as guesses to confirm", () => {
    const mapping = mapHeaders(["Block", "Strian", "Weight", "Flush"]);
    expect(mapping.used).toMatchObject({ Strian: "strain", Weight: "fresh_weight" });
    expect(mapping.uncertain).toEqual(["Strian", "Weight"]);
    expect(mapping.certain).toBe(false);
  });

  it("lets the mapping option win, ignore a column, and report a target that is no column", () => {
    const mapping = mapHeaders(["Sack", "Souche", "Block"], { Sack: "block_id", Souche: "strain", Block: "ignore", Other: "nonsense" });
    expect(mapping.used).toEqual({ Sack: "block_id", Souche: "strain" });
    expect(mapping.columns.map((column) => column.how)).toEqual(["given", "given", "given"]);
    expect(mapHeaders(["A"], { A: "nonsense" }).badTargets).toEqual(["nonsense"]);
  });

  it("gives each schema column to one header only and lists missing required columns", () => {
    const mapping = mapHeaders(["Block", "Bag", "Flush"]);
    expect(mapping.used).toEqual({ Block: "block_id", Flush: "flush" });
    expect(mapping.unmatched).toEqual(["Bag"]);
    expect(mapping.missingRequired).toEqual(["strain"]);
  });
});
