import { GRAMS_PER_OUNCE, GRAMS_PER_POUND } from "../units";
import { seededRandom } from "../random";

/** How the generated sheet is written: as the template, as a comma-decimal locale exports it, or in US units and dates. */
export type SeasonLogStyle = "template" | "european" | "imperial";

export interface GenerateSeasonLogOptions {
  /** Data rows to write (the header is extra). */
  rows: number;
  seed?: number;
  style?: SeasonLogStyle;
  /** Prefix of the block codes, so two farms' sheets differ. */
  blockPrefix?: string;
}

/** Strain codes of the invented co-op used in demos and tests. */
export const demoStrains = ["PO-03", "PO-07", "LM-01", "SH-12", "TT-02", "RE-01"] as const;
const substrates = ["HW-80/20", "HW-90/10", "SD-2"] as const;
const methods = ["X-cut", "slits", "open top"] as const;
// Share of a block's yield per flush (Agarawal & Topwal 2018: 648 / 420 / 259 g of 1327 g), a fourth flush smaller again.
const flushShares = [0.488, 0.316, 0.195, 0.1] as const;
const millisecondsPerDay = 86_400_000;
const seasonStart = Date.UTC(2026, 0, 5);

function isoDay(time: number): string {
  return new Date(time).toISOString().slice(0, 10);
}

function writeDate(time: number, style: SeasonLogStyle): string {
  const [year, month, day] = isoDay(time).split("-");
  if (style === "european") return `${day}.${month}.${year}`;
  if (style === "imperial") return `${month}/${day}/${year}`;
  return `${year}-${month}-${day}`;
}

function writeMass(grams: number, style: SeasonLogStyle, large: boolean): string {
  if (style === "european") return large ? (grams / 1000).toFixed(2).replace(".", ",") : grams.toFixed(1).replace(".", ",");
  if (style === "imperial") {
    const ounces = Math.round(grams / GRAMS_PER_OUNCE);
    const pounds = Math.floor(ounces / 16);
    return pounds > 0 ? `${pounds} lb ${ounces - pounds * 16} oz` : `${ounces} oz`;
  }
  return large ? `${(grams / 1000).toFixed(2)} kg` : `${Math.round(grams)} g`;
}

const headers: Readonly<Record<SeasonLogStyle, string>> = {
  template:
    "block_id,strain,substrate,trial,arm,inoculated_on,block_wet_weight,substrate_moisture,fruiting_method,flush,harvested_on,fresh_weight,dry_weight,contaminated,contaminated_on,spent_weight,notes",
  european:
    "Block;Strain;Substrate;Trial;Arm;Inoculated;Wet block (kg);Moisture;Fruiting method;Flush;Harvested;Fresh (g);Dry (g);Contaminated;Contaminated on;Spent (kg);Notes",
  imperial:
    "Bag,Strain,Recipe,Trial,Arm,Inoculated,Wet block,Moisture,Fruiting,Flush,Harvest date,Fresh weight,Dry weight,Contaminated,Contaminated on,Spent block,Notes",
};

/**
 * Lines of a realistic, valid season log (header first, one row per harvest, a block row
 * for blocks not yet fruiting), in the order a farm adds them. Invented data only.
 */
export function* seasonLogLines(options: GenerateSeasonLogOptions): Generator<string> {
  const style = options.style ?? "template";
  // A seed always gives the same sheet.
  const random = seededRandom(options.seed ?? 1).next;
  const separator = style === "european" ? ";" : ",";
  const prefix = options.blockPrefix ?? "B";
  yield headers[style];
  let written = 0;
  for (let block = 1; written < options.rows; block++) {
    const code = `${prefix}-${String(block).padStart(5, "0")}`;
    const strain = demoStrains[Math.floor(random() * demoStrains.length)];
    const substrate = substrates[Math.floor(random() * substrates.length)];
    const inoculated = seasonStart + Math.floor(random() * 120) * millisecondsPerDay;
    const wetGrams = style === "imperial" ? (5 + Math.floor(random() * 3)) * GRAMS_PER_POUND : 2200 + Math.round(random() * 600);
    const moisture = 0.58 + Math.round(random() * 7) / 100;
    const method = methods[Math.floor(random() * methods.length)];
    const contaminated = random() < 0.06;
    const flushes = contaminated ? 0 : Math.floor(random() * 5);
    const efficiency = 0.5 + random() * 0.6;
    const dryGrams = wetGrams * (1 - moisture);
    const moistureText =
      style === "european"
        ? `${Math.round(moisture * 100)} %`
        : style === "imperial"
          ? moisture.toFixed(2)
          : `${Math.round(moisture * 100)} %`;
    const contaminatedOn = contaminated ? writeDate(inoculated + (10 + Math.floor(random() * 20)) * millisecondsPerDay, style) : "";
    const blockCells = [
      code,
      strain,
      substrate,
      // Trial and arm stay blank: a block naming a trial must be on the farm's randomised list, and generated farms have none.
      "",
      "",
      writeDate(inoculated, style),
      writeMass(wetGrams, style, true),
      moistureText,
      method,
    ];
    const spent = flushes >= 3 ? writeMass(wetGrams * (0.45 + random() * 0.1), style, true) : "";
    const tail = (last: boolean, note: string) => [contaminated ? "yes" : "no", contaminatedOn, last ? spent : "", note];
    if (flushes === 0) {
      yield [...blockCells, "", "", "", "", ...tail(false, contaminated ? "green mould" : "")].join(separator);
      written++;
      continue;
    }
    let day = inoculated + (28 + Math.floor(random() * 14)) * millisecondsPerDay;
    for (let flush = 1; flush <= flushes && written < options.rows; flush++) {
      const freshGrams = dryGrams * efficiency * flushShares[flush - 1];
      const dried = random() < 0.2 ? writeMass(freshGrams * 0.1, style, false) : "";
      const note = random() < 0.05 ? (style === "european" ? '"pinned late; side pins"' : '"pinned late, side pins"') : "";
      yield [
        ...blockCells,
        String(flush),
        writeDate(day, style),
        writeMass(freshGrams, style, false),
        dried,
        ...tail(flush === flushes, note),
      ].join(separator);
      written++;
      day += (10 + Math.floor(random() * 8)) * millisecondsPerDay;
    }
  }
}

/** A whole generated season log as one text, for tests and small benchmarks. */
export function generateSeasonLog(options: GenerateSeasonLogOptions): string {
  return `${[...seasonLogLines(options)].join("\r\n")}\r\n`;
}
