import Papa from "papaparse";
import type { StrainSource } from "./lists";

/** The four registries a co-op keeps, and the CSV columns each imports from. */
export const registryKinds = ["species", "strains", "substrate_recipes", "treatments"] as const;
export type RegistryKind = (typeof registryKinds)[number];

export const registryLabels: Record<RegistryKind, string> = {
  species: "Species",
  strains: "Strains",
  substrate_recipes: "Substrate recipes",
  treatments: "Fruiting methods, climate regimes and other treatments",
};

export const registryColumns: Record<RegistryKind, { required: string[]; optional: string[] }> = {
  species: { required: ["scientific_name", "common_name"], optional: [] },
  strains: { required: ["code", "species", "name", "source"], optional: ["notes"] },
  substrate_recipes: {
    required: ["code", "name", "base", "target_moisture_percent", "treatment"],
    optional: ["supplement", "supplement_percent"],
  },
  treatments: { required: ["code", "name"], optional: ["kind", "description"] },
};

export type RegistryRow =
  | { kind: "species"; scientificName: string; commonName: string }
  | { kind: "strains"; code: string; species: string; name: string; source: StrainSource; notes: string }
  | {
      kind: "substrate_recipes";
      code: string;
      name: string;
      base: string;
      supplement: string;
      supplementPercent: number;
      targetMoisture: number;
      treatment: "sterilised" | "pasteurised";
    }
  | { kind: "treatments"; code: string; name: string; treatmentKind: "fruiting_method" | "humidity" | "other"; description: string };

export interface CsvProblem {
  line: number;
  column: string;
  value: string;
  message: string;
}

const sourceWords: Record<string, StrainSource> = {
  culture_bank: "culture_bank",
  "culture bank": "culture_bank",
  "wild clone": "wild_clone",
  wild_clone: "wild_clone",
  "own isolate": "own_isolate",
  own_isolate: "own_isolate",
};
const treatmentWords: Record<string, "sterilised" | "pasteurised"> = {
  sterilised: "sterilised",
  sterilized: "sterilised",
  pasteurised: "pasteurised",
  pasteurized: "pasteurised",
};
const kindWords: Record<string, "fruiting_method" | "humidity" | "other"> = {
  "": "fruiting_method",
  fruiting_method: "fruiting_method",
  "fruiting method": "fruiting_method",
  humidity: "humidity",
  other: "other",
};

function percent(value: string, column: string, line: number, problems: CsvProblem[], upper: number): number {
  const number = Number(value.replace("%", "").replace(",", ".").trim());
  if (value.trim() === "" || !Number.isFinite(number) || number < 0 || number > upper) {
    problems.push({ line, column, value, message: `Give a percentage from 0 to ${upper}, e.g. 62.` });
    return 0;
  }
  return number;
}

/**
 * Reads a registry list from CSV. Header names are matched without regard to case or spaces;
 * every problem names its line (the header is line 1), column and value. Nothing is half-read:
 * a caller saves the rows only when there are no problems.
 */
export function parseRegistryCsv(kind: RegistryKind, text: string): { rows: RegistryRow[]; problems: CsvProblem[] } {
  const parsed = Papa.parse<Record<string, string>>(text.replace(/^\uFEFF/, ""), {
    header: true,
    skipEmptyLines: "greedy",
    transformHeader: (header) =>
      header
        .trim()
        .toLowerCase()
        .replace(/[\s-]+/g, "_"),
  });
  const problems: CsvProblem[] = [];
  const headers = parsed.meta.fields ?? [];
  const missing = registryColumns[kind].required.filter((column) => !headers.includes(column));
  if (missing.length) {
    return {
      rows: [],
      problems: missing.map((column) => ({
        line: 1,
        column,
        value: "",
        message: `The header has no "${column}" column. Expected columns: ${[...registryColumns[kind].required, ...registryColumns[kind].optional].join(", ")}.`,
      })),
    };
  }
  const rows: RegistryRow[] = [];
  const seen = new Map<string, number>();
  parsed.data.forEach((raw, index) => {
    const line = index + 2;
    const cell = (column: string) => (raw[column] ?? "").trim();
    const before = problems.length;
    for (const column of registryColumns[kind].required) {
      if (cell(column) === "" && !(kind === "substrate_recipes" && column === "target_moisture_percent")) {
        problems.push({ line, column, value: "", message: `Fill in ${column.replace(/_/g, " ")}.` });
      }
    }
    const key = kind === "species" ? cell("scientific_name").toLowerCase() : cell("code").toUpperCase();
    if (key && seen.has(key))
      problems.push({
        line,
        column: kind === "species" ? "scientific_name" : "code",
        value: key,
        message: `Repeats line ${seen.get(key)}: each entry once.`,
      });
    else if (key) seen.set(key, line);

    let row: RegistryRow | null = null;
    if (kind === "species") row = { kind, scientificName: cell("scientific_name"), commonName: cell("common_name") };
    if (kind === "strains") {
      const source = sourceWords[cell("source").toLowerCase()];
      if (!source && cell("source"))
        problems.push({ line, column: "source", value: cell("source"), message: "Use culture bank, wild clone or own isolate." });
      row = {
        kind,
        code: cell("code").toUpperCase(),
        species: cell("species"),
        name: cell("name"),
        source: source ?? "culture_bank",
        notes: cell("notes"),
      };
    }
    if (kind === "substrate_recipes") {
      const treatment = treatmentWords[cell("treatment").toLowerCase()];
      if (!treatment && cell("treatment"))
        problems.push({ line, column: "treatment", value: cell("treatment"), message: "Use sterilised or pasteurised." });
      const moisture = percent(cell("target_moisture_percent"), "target_moisture_percent", line, problems, 99);
      const supplement =
        cell("supplement_percent") === "" ? 0 : percent(cell("supplement_percent"), "supplement_percent", line, problems, 100);
      row = {
        kind,
        code: cell("code").toUpperCase(),
        name: cell("name"),
        base: cell("base"),
        supplement: cell("supplement"),
        supplementPercent: supplement,
        targetMoisture: moisture / 100,
        treatment: treatment ?? "sterilised",
      };
    }
    if (kind === "treatments") {
      const treatmentKind = kindWords[cell("kind").toLowerCase()];
      if (!treatmentKind) problems.push({ line, column: "kind", value: cell("kind"), message: "Use fruiting method, humidity or other." });
      row = {
        kind,
        code: cell("code").toUpperCase(),
        name: cell("name"),
        treatmentKind: treatmentKind ?? "other",
        description: cell("description"),
      };
    }
    if (row && problems.length === before) rows.push(row);
  });
  if (parsed.data.length === 0) problems.push({ line: 2, column: "", value: "", message: "The file has a header but no entries." });
  return { rows, problems };
}

export function describeProblem(problem: CsvProblem): string {
  return `Line ${problem.line}${problem.column ? `, column ${problem.column}` : ""}${problem.value ? ` ("${problem.value}")` : ""}: ${problem.message}`;
}
