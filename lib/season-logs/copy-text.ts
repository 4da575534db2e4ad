/**
 * Rows in PostgreSQL's COPY text format (PostgreSQL documentation, COPY, "Text Format"): one
 * line a row, columns separated by tabs, \N for null, and backslash, tab, newline and carriage
 * return written as backslash escapes, so any cell a grower typed comes back as typed.
 */
export type CopyValue = string | number | boolean | null | undefined;

const escapes: Record<string, string> = { "\\": "\\\\", "\t": "\\t", "\n": "\\n", "\r": "\\r" };
const needsEscape = /[\\\t\n\r]/;
const escapable = /[\\\t\n\r]/g;

export function copyCell(value: CopyValue): string {
  if (value === null || value === undefined) return "\\N";
  if (typeof value === "boolean") return value ? "t" : "f";
  if (typeof value === "number") {
    if (!Number.isFinite(value)) throw new Error(`a number to store must be finite, not ${value}`);
    return String(value);
  }
  return needsEscape.test(value) ? value.replace(escapable, (mark) => escapes[mark]) : value;
}

/** The rows as text of about `chunkLength` characters each: a COPY stream takes them as they come, without one string of the whole. */
export function* copyChunks<T>(rows: Iterable<T>, cells: (row: T) => CopyValue[], chunkLength = 256 * 1024): Generator<string> {
  let chunk = "";
  for (const row of rows) {
    const values = cells(row);
    let line = copyCell(values[0]);
    for (let column = 1; column < values.length; column++) line += `\t${copyCell(values[column])}`;
    chunk += `${line}\n`;
    if (chunk.length >= chunkLength) {
      yield chunk;
      chunk = "";
    }
  }
  if (chunk.length > 0) yield chunk;
}
