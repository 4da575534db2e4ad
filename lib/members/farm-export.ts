/**
 * What a farm's data download holds: one CSV per kind of row, the original files, and a README
 * that says what every column means. Column lists live here so the README and the CSVs agree.
 */
export interface ExportColumn {
  key: string;
  header: string;
  meaning: string;
}

export const exportFiles = {
  blocks: {
    file: "blocks.csv",
    about: "One row per block your farm recorded.",
    columns: [
      { key: "code", header: "block", meaning: "Your farm's own code for the block." },
      { key: "strainCode", header: "strain", meaning: "The co-op's code for the strain the block was inoculated with." },
      { key: "substrateRecipeCode", header: "substrate_recipe", meaning: "The co-op's code for the substrate recipe, if recorded." },
      {
        key: "fruitingMethodCode",
        header: "fruiting_method",
        meaning: "The co-op's code for how the bag was opened for fruiting, if recorded.",
      },
      { key: "inoculatedOn", header: "inoculated_on", meaning: "Date the block was inoculated (YYYY-MM-DD)." },
      { key: "wetMassG", header: "wet_mass_g", meaning: "Wet block mass in grams, as the server normalised it." },
      { key: "wetMassAsWritten", header: "wet_mass_as_written", meaning: "The wet mass exactly as your sheet gave it." },
      { key: "moisture", header: "moisture", meaning: "Moisture content, wet basis, as a fraction (0.62 = 62 %)." },
      { key: "contaminated", header: "contaminated", meaning: "true if the block was lost to contamination." },
      { key: "contaminatedOn", header: "contaminated_on", meaning: "Date contamination was noticed, if any." },
      { key: "spentMassG", header: "spent_mass_g", meaning: "Spent block mass in grams after the last flush, if weighed." },
      { key: "spentMassAsWritten", header: "spent_mass_as_written", meaning: "The spent mass exactly as your sheet gave it." },
      { key: "notes", header: "notes", meaning: "Free notes recorded with the block." },
      { key: "createdAt", header: "recorded_at", meaning: "When the block first reached Rhizomorph (UTC)." },
    ],
  },
  harvests: {
    file: "harvests.csv",
    about: "One row per flush picked from a block.",
    columns: [
      { key: "blockCode", header: "block", meaning: "The block the flush came from (see blocks.csv)." },
      { key: "flush", header: "flush", meaning: "Flush number: 1 for the first wave of fruit bodies, 2 for the second …" },
      { key: "harvestedOn", header: "harvested_on", meaning: "Date picked (YYYY-MM-DD)." },
      { key: "freshMassG", header: "fresh_mass_g", meaning: "Fresh weight of the flush in grams." },
      { key: "freshMassAsWritten", header: "fresh_mass_as_written", meaning: "The fresh weight exactly as your sheet gave it." },
      { key: "dryMassG", header: "dry_mass_g", meaning: "Dry weight in grams after dehydrating, if weighed." },
      { key: "dryMassAsWritten", header: "dry_mass_as_written", meaning: "The dry weight exactly as your sheet gave it." },
    ],
  },
  uploads: {
    file: "uploads.csv",
    about: "Every season-log file your farm sent; the files themselves are in originals/.",
    columns: [
      { key: "archiveName", header: "file_in_download", meaning: "Where the original file sits in this download." },
      { key: "fileName", header: "file_name", meaning: "The file's name when it was uploaded." },
      { key: "uploadedAt", header: "uploaded_at", meaning: "When it was uploaded (UTC)." },
      { key: "sha256", header: "sha256", meaning: "SHA-256 fingerprint of the file, to check the copy is exact." },
      { key: "sizeBytes", header: "size_bytes", meaning: "File size in bytes." },
      { key: "outcome", header: "outcome", meaning: "What became of it: received, rejected, committed or already_imported." },
      { key: "rowCount", header: "rows", meaning: "Number of data rows in the file." },
    ],
  },
  changes: {
    file: "value-changes.csv",
    about: "Values a later upload or correction replaced, with the old and new value.",
    columns: [
      { key: "blockCode", header: "block", meaning: "The block whose value changed." },
      { key: "flush", header: "flush", meaning: "The flush, when the value belonged to one." },
      { key: "field", header: "field", meaning: "Which value changed." },
      { key: "oldValue", header: "old_value", meaning: "The value before." },
      { key: "newValue", header: "new_value", meaning: "The value after." },
      { key: "changedAt", header: "changed_at", meaning: "When it changed (UTC)." },
      {
        key: "reason",
        header: "reason",
        meaning: "Why a person changed it in the app (an edit, a deletion, an undone commit); blank for a file's change.",
      },
    ],
  },
  activity: {
    file: "activity.csv",
    about: "Your farm's own entries in the activity log.",
    columns: [
      { key: "occurredAt", header: "occurred_at", meaning: "When it happened (UTC)." },
      { key: "actorLabel", header: "who", meaning: "The person who did it (blank for the system)." },
      { key: "action", header: "action", meaning: "What was done, e.g. member.invited or season-log.committed." },
      { key: "subject", header: "subject", meaning: "What it was done to." },
      { key: "details", header: "details", meaning: "Further details as JSON." },
    ],
  },
} satisfies Record<string, { file: string; about: string; columns: ExportColumn[] }>;

/** A safe, unique name inside the download for an uploaded file. */
export function originalFileName(index: number, fileName: string): string {
  const cleaned =
    fileName
      .replace(/[^A-Za-z0-9._-]+/g, "_")
      .replace(/\.{2,}/g, "_")
      .replace(/_+/g, "_")
      .replace(/^[._]+/, "") || "file";
  return `originals/${String(index + 1).padStart(4, "0")}-${cleaned}`;
}

export function exportReadme(input: {
  farmName: string;
  cooperativeName: string;
  exportedAt: Date;
  counts: Record<keyof typeof exportFiles, number>;
}): string {
  const sections = Object.entries(exportFiles).map(([kind, spec]) => {
    const count = input.counts[kind as keyof typeof exportFiles];
    const columns = spec.columns.map((column) => `  ${column.header}: ${column.meaning}`).join("\n");
    return `${spec.file} (${count} rows)\n${spec.about}\n${columns}`;
  });
  return [
    `Everything ${input.farmName} gave ${input.cooperativeName} through Rhizomorph`,
    `Downloaded ${input.exportedAt.toISOString()} (UTC).`,
    "",
    "Masses are in grams, with the value as your sheet wrote it kept beside them. CSV files use commas, UTF-8 and one header row; cells that began with = + - or @ start with an apostrophe so a spreadsheet does not run them.",
    "",
    ...sections.flatMap((section) => [section, ""]),
    "originals/: each uploaded file byte for byte, named as in uploads.csv.",
  ].join("\n");
}

/** The typed confirmation a withdrawal needs: the farm's own name, spaces and case forgiven. */
export function withdrawalConfirmed(farmName: string, typed: string): boolean {
  const normalise = (value: string) => value.trim().replace(/\s+/g, " ").toLowerCase();
  return normalise(typed) !== "" && normalise(typed) === normalise(farmName);
}
