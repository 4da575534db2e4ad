/** The longest search the blocks table takes: enough for any block code or a phrase of a note. */
export const longestBlockSearch = 100;

/**
 * A search in an address (?q=tray 4): trimmed, inner runs of spaces made one, cut at
 * `longestBlockSearch` characters; null for none, a blank one or a repeated parameter's later values.
 */
export function blockSearchFromSearchParam(value: string | string[] | undefined): string | null {
  const text = (Array.isArray(value) ? value[0] : value)?.replace(/\s+/g, " ").trim();
  return text ? text.slice(0, longestBlockSearch) : null;
}

/**
 * An ILIKE pattern that finds the search anywhere in a code or note, taken literally: `%`, `_` and
 * the escape character `\` are escaped, so "10%" finds "10%" and not every code with "10" in it.
 */
export function containsPattern(search: string): string {
  return `%${search.replace(/[\\%_]/g, (mark) => `\\${mark}`)}%`;
}
