import { toCsv } from "../csv";
import { decimalEvidence } from "../units";

/**
 * Downloads in the season-log upload format (the blocks export, the farm's trial list): the
 * schema's column names with the unit in the header, so a grower can fill one in and upload it
 * as it stands, and an unchanged export uploads without changing anything.
 */

/** A block as the export writes it: register codes, masses in grams, moisture as a fraction. */
export interface ExportBlock {
  code: string;
  strainCode: string;
  substrateCode: string | null;
  trialCode: string | null;
  armLabel: string | null;
  inoculatedOn: string | null;
  /** The season the block's season log named, if any (a block without one follows its inoculation date). */
  seasonYear?: number | null;
  wetMassG: number | null;
  moisture: number | null;
  fruitingMethodCode: string | null;
  /** The name of the farm's room the block fruited in from the start (its move with no date), if any. */
  roomName?: string | null;
  contaminated: boolean;
  contaminatedOn: string | null;
  spentMassG: number | null;
  notes: string;
}

export interface ExportHarvest {
  blockCode: string;
  flush: number;
  harvestedOn: string | null;
  freshMassG: number;
  dryMassG: number | null;
}

const columns = [
  { key: "block_id", header: "block_id" },
  { key: "strain", header: "strain" },
  { key: "substrate", header: "substrate" },
  { key: "trial", header: "trial" },
  { key: "arm", header: "arm" },
  { key: "inoculated_on", header: "inoculated_on" },
  { key: "season", header: "season" },
  { key: "block_wet_weight", header: "block_wet_weight (g)" },
  { key: "substrate_moisture", header: "substrate_moisture (%)" },
  { key: "fruiting_method", header: "fruiting_method" },
  { key: "fruiting_room", header: "fruiting_room" },
  { key: "flush", header: "flush" },
  { key: "harvested_on", header: "harvested_on" },
  { key: "fresh_weight", header: "fresh_weight (g)" },
  { key: "dry_weight", header: "dry_weight (g)" },
  { key: "contaminated", header: "contaminated" },
  { key: "contaminated_on", header: "contaminated_on" },
  { key: "spent_weight", header: "spent_weight (g)" },
  { key: "notes", header: "notes" },
];

/** Up to `places` decimals, trailing zeros dropped: 2500, 2267.962, 62.5. */
function trimmed(value: number, places: number): string {
  return String(Number(value.toFixed(places)));
}

/**
 * Grams to a milligram (what a commit compares to), so an unchanged export changes nothing.
 * A number the importer could read two ways ("340.194": 340.194 g or 340 194 g) gets a fourth
 * decimal, so the file settles its own decimal mark.
 */
export function exportGrams(grams: number | null): string {
  if (grams === null) return "";
  const text = trimmed(grams, 3);
  return decimalEvidence(text) === "either" ? grams.toFixed(4) : text;
}

/** Moisture (a fraction, wet basis) as a percentage to a thousandth of a point: 0.62 → 62. */
export function exportPercent(fraction: number | null): string {
  return fraction === null ? "" : trimmed(fraction * 100, 3);
}

function blockCells(block: ExportBlock): Record<string, string> {
  return {
    block_id: block.code,
    strain: block.strainCode,
    substrate: block.substrateCode ?? "",
    trial: block.trialCode ?? "",
    arm: block.armLabel ?? "",
    inoculated_on: block.inoculatedOn ?? "",
    season: block.seasonYear == null ? "" : String(block.seasonYear),
    block_wet_weight: exportGrams(block.wetMassG),
    substrate_moisture: exportPercent(block.moisture),
    fruiting_method: block.fruitingMethodCode ?? "",
    fruiting_room: block.roomName ?? "",
    contaminated: block.contaminated ? "yes" : "no",
    contaminated_on: block.contaminatedOn ?? "",
    spent_weight: exportGrams(block.spentMassG),
    notes: block.notes,
  };
}

/** One row per harvest, each with its block's columns; a block with no harvest yet gets one row with the flush blank. */
export function seasonLogExportCsv(blocks: readonly ExportBlock[], harvests: readonly ExportHarvest[]): string {
  const byBlock = new Map<string, ExportHarvest[]>();
  for (const harvest of harvests) {
    const list = byBlock.get(harvest.blockCode) ?? [];
    list.push(harvest);
    byBlock.set(harvest.blockCode, list);
  }
  const rows: Record<string, string>[] = [];
  for (const block of blocks) {
    const cells = blockCells(block);
    const flushes = (byBlock.get(block.code) ?? []).sort((a, b) => a.flush - b.flush);
    if (flushes.length === 0) rows.push(cells);
    for (const harvest of flushes)
      rows.push({
        ...cells,
        flush: String(harvest.flush),
        harvested_on: harvest.harvestedOn ?? "",
        fresh_weight: exportGrams(harvest.freshMassG),
        dry_weight: exportGrams(harvest.dryMassG),
      });
  }
  return `${toCsv(rows, columns)}\r\n`;
}

/** A block code on the farm's randomised list, with what its arm fixes. */
export interface ListedBlock {
  blockCode: string;
  trialCode: string;
  armLabel: string;
  strainCode: string;
  /** The arm's fruiting method code; null when the arm fixes none. */
  fruitingMethodCode: string | null;
  /** A room-level trial: the farm's room the block fruits in (its room was drawn to the block's arm). */
  roomName?: string | null;
}

/**
 * The farm's randomised list as a season log to fill in: one row per listed block, in the list's
 * order, with the strain, trial, arm and fruiting method the list fixes and the rest blank.
 */
export function trialListCsv(list: readonly ListedBlock[]): string {
  const rows = list.map((entry) => ({
    block_id: entry.blockCode,
    strain: entry.strainCode,
    trial: entry.trialCode,
    arm: entry.armLabel,
    fruiting_method: entry.fruitingMethodCode ?? "",
    fruiting_room: entry.roomName ?? "",
  }));
  return `${toCsv(rows, columns)}\r\n`;
}
