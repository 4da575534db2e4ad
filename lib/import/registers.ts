/** Levenshtein distance: the fewest single-letter insertions, deletions or substitutions from one text to the other. */
export function editDistance(a: string, b: string): number {
  if (a === b) return 0;
  let previous = Array.from({ length: b.length + 1 }, (_, index) => index);
  let current = new Array<number>(b.length + 1);
  for (let i = 1; i <= a.length; i++) {
    current[0] = i;
    for (let j = 1; j <= b.length; j++) {
      const substitution = previous[j - 1] + (a.charCodeAt(i - 1) === b.charCodeAt(j - 1) ? 0 : 1);
      current[j] = Math.min(previous[j] + 1, current[j - 1] + 1, substitution);
    }
    [previous, current] = [current, previous];
  }
  return previous[b.length];
}

// Letters a hand or a font mixes up with digits: O and 0; l, 1 and I (keys are upper case, so l is L).
const lookalikes = [new Set(["O", "0"]), new Set(["L", "1", "I"])];
const lookalikeCost = 0.25;

function substitutionCost(a: string, b: string): number {
  if (a === b) return 0;
  return lookalikes.some((group) => group.has(a) && group.has(b)) ? lookalikeCost : 1;
}

/**
 * Edit distance in which swapping a letter for its look-alike digit (O/0, l/1/I) costs a quarter
 * of any other edit, so "PO-1O" is nearer "PO-10" than "PO-11" and "HWB-2O" nearest "HWB-20".
 */
export function lookalikeDistance(a: string, b: string): number {
  if (a === b) return 0;
  let previous = Array.from({ length: b.length + 1 }, (_, index) => index);
  let current = new Array<number>(b.length + 1);
  for (let i = 1; i <= a.length; i++) {
    current[0] = i;
    for (let j = 1; j <= b.length; j++) {
      current[j] = Math.min(previous[j] + 1, current[j - 1] + 1, previous[j - 1] + substitutionCost(a[i - 1], b[j - 1]));
    }
    [previous, current] = [current, previous];
  }
  return previous[b.length];
}

/**
 * How a code or name is compared: case, accents, spaces and punctuation do not matter
 * ("po 03" is PO-03, "slits cut across the bag" is "Slits cut across the bag").
 */
export function registerKey(text: string): string {
  return text
    .normalize("NFKD")
    .replace(/\p{M}+/gu, "")
    .toUpperCase()
    .replace(/[^\p{L}\p{N}]+/gu, "-")
    .replace(/^-+|-+$/g, "");
}

/** One entry of a co-op register: the code a file should use, and the names it may be written by instead. */
export interface RegisterEntryText {
  code: string;
  names?: readonly string[];
}

/**
 * One of the co-op's registers (strains, substrate recipes, fruiting methods, species) for
 * reading what a grower wrote: an entry is found by its code or by any of its names; an
 * unknown text gets the nearest entry as a suggestion. A name two entries share finds neither
 * (the file must use the code), but codes are unique.
 */
export class RegisterMatcher<T extends RegisterEntryText> {
  private readonly byCode = new Map<string, T>();
  private readonly byName = new Map<string, T | null>();

  constructor(entries: readonly T[]) {
    for (const entry of entries) this.byCode.set(registerKey(entry.code), entry);
    for (const entry of entries) {
      for (const name of entry.names ?? []) {
        const key = registerKey(name);
        if (key === "" || this.byCode.has(key)) continue;
        const already = this.byName.get(key);
        this.byName.set(key, already === undefined || already === entry ? entry : null);
      }
    }
  }

  /** The entry the text names by code or by name, or null when it names none (or a name several entries share). */
  find(text: string): T | null {
    const key = registerKey(text);
    return this.byCode.get(key) ?? this.byName.get(key) ?? null;
  }

  /** The entry nearest in spelling to its code or one of its names, or null when none is close. */
  nearest(text: string): T | null {
    const key = registerKey(text);
    if (key === "") return null;
    let best: T | null = null;
    // Up to half the text's length may differ (at least two edits): beyond that a suggestion is a guess.
    let bestDistance = Math.max(2, Math.ceil(key.length / 2)) + 0.001;
    const consider = (candidate: string, entry: T | null) => {
      if (entry === null) return;
      const distance = lookalikeDistance(key, candidate);
      if (distance < bestDistance) {
        best = entry;
        bestDistance = distance;
      }
    };
    for (const [candidate, entry] of this.byCode) consider(candidate, entry);
    for (const [candidate, entry] of this.byName) consider(candidate, entry);
    return best;
  }

  /** ` Did you mean "PO-03" (Grey oyster)?`, or "" when nothing is close: to append to a message. */
  suggestion(text: string): string {
    const near = this.nearest(text);
    if (near === null) return "";
    const name = near.names?.[0];
    return name ? ` Did you mean "${near.code}" (${name})?` : ` Did you mean "${near.code}"?`;
  }
}
