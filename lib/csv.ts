import Papa from "papaparse";

/**
 * CSV for people to open in a spreadsheet. Cells that start with = + - @ (or a tab or
 * carriage return) are prefixed with an apostrophe so a spreadsheet shows them as text
 * instead of running them as formulas (CSV formula injection).
 */
export function toCsv(rows: Record<string, unknown>[], columns?: { key: string; header: string }[]): string {
  const chosen = columns ?? Object.keys(rows[0] ?? {}).map((key) => ({ key, header: key }));
  return Papa.unparse(
    {
      fields: chosen.map((column) => column.header),
      data: rows.map((row) => chosen.map((column) => cellText(row[column.key]))),
    },
    { escapeFormulae: true, newline: "\r\n" },
  );
}

// Numbers stay numbers, so a negative difference is not mistaken for a formula.
function cellText(value: unknown): string | number {
  if (value === null || value === undefined) return "";
  if (typeof value === "number") return value;
  if (value instanceof Date) return value.toISOString();
  if (typeof value === "string") return value;
  if (typeof value === "boolean" || typeof value === "bigint") return String(value);
  return JSON.stringify(value) ?? "";
}
