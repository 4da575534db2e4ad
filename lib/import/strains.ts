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

const separators = /[\s_.\-/]+/g;

function strainKey(code: string): string {
  return code.trim().toUpperCase().replace(separators, "-");
}

/**
 * The co-op's strain register for checking uploaded codes. Case and separators do not
 * matter ("po 03" is PO-03); anything else unknown gets the nearest code as a suggestion.
 */
export class StrainRegister {
  private readonly byKey = new Map<string, string>();

  constructor(codes: readonly string[]) {
    for (const code of codes) this.byKey.set(strainKey(code), code);
  }

  /** The co-op's own spelling of a code, or null when the co-op has no such strain. */
  find(code: string): string | null {
    return this.byKey.get(strainKey(code)) ?? null;
  }

  /** The known code nearest in spelling, or null when none is close. */
  nearest(code: string): string | null {
    const key = strainKey(code);
    let best: string | null = null;
    let bestDistance = Math.max(2, Math.ceil(key.length / 2)) + 1;
    for (const [candidate, original] of this.byKey) {
      const distance = editDistance(key, candidate);
      if (distance < bestDistance) {
        best = original;
        bestDistance = distance;
      }
    }
    return best;
  }
}
