/** Words around counts, shared by every page, e-mail and message so a count and its noun always agree. */

/** "1 block", "3 blocks", "0 blocks"; give the plural when it is not the noun and an s ("1 entry", "2 entries"). */
export function count(n: number, one: string, many: string = `${one}s`): string {
  return `${n} ${n === 1 ? one : many}`;
}

/** The verb that agrees with a count: "1 farm has", "2 farms have". */
export function agree(n: number, one: string, many: string): string {
  return n === 1 ? one : many;
}

/** "a, b and c". */
export function listInWords(items: readonly string[]): string {
  if (items.length <= 1) return items.join("");
  return `${items.slice(0, -1).join(", ")} and ${items.at(-1)}`;
}
