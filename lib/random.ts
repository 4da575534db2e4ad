/**
 * A small seeded random number generator (mulberry32), so demo data, generated benchmark
 * logs and trial randomisation lists come out the same from the same seed.
 */
export interface Random {
  /** Uniform in [0, 1). */
  next: () => number;
  /** Whole number in [min, max], both included. */
  integer: (min: number, max: number) => number;
  /** Normal with the given mean and standard deviation (Box–Muller). */
  normal: (mean: number, sd: number) => number;
  pick<T>(items: readonly T[]): T;
  shuffle<T>(items: readonly T[]): T[];
}

function hashSeed(seed: string | number): number {
  if (typeof seed === "number") return seed >>> 0;
  let hash = 2166136261;
  for (let index = 0; index < seed.length; index++) {
    hash ^= seed.charCodeAt(index);
    hash = Math.imul(hash, 16777619);
  }
  return hash >>> 0;
}

export function seededRandom(seed: string | number): Random {
  let state = hashSeed(seed);
  const next = () => {
    state = (state + 0x6d2b79f5) >>> 0;
    let t = state;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
  const integer = (min: number, max: number) => min + Math.floor(next() * (max - min + 1));
  return {
    next,
    integer,
    normal(mean, sd) {
      const u = 1 - next();
      const v = next();
      return mean + sd * Math.sqrt(-2 * Math.log(u)) * Math.cos(2 * Math.PI * v);
    },
    pick: (items) => items[integer(0, items.length - 1)],
    shuffle(items) {
      const copy = [...items];
      for (let index = copy.length - 1; index > 0; index--) {
        const other = integer(0, index);
        [copy[index], copy[other]] = [copy[other], copy[index]];
      }
      return copy;
    },
  };
}
