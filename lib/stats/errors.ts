/** What was wrong with the input, so callers can map it to a field or an HTTP 400. */
export type StatsInputErrorCode =
  | "empty_group"
  | "too_few_values"
  | "not_a_number"
  | "negative_mass"
  | "moisture_out_of_range"
  | "invalid_level"
  | "invalid_argument"
  | "no_variation"
  | "not_estimable";

/**
 * The one error `lib/stats` throws for input it cannot turn into an honest number.
 * The message says what to change; `code` is stable for programs.
 */
export class StatsInputError extends Error {
  readonly code: StatsInputErrorCode;

  constructor(code: StatsInputErrorCode, message: string) {
    super(message);
    this.name = "StatsInputError";
    this.code = code;
  }
}

export function requireFinite(value: number, what: string): void {
  if (!Number.isFinite(value)) {
    throw new StatsInputError("not_a_number", `${what} is ${value}; enter a number (check for blank cells or text in a number column).`);
  }
}

export function requireAllFinite(xs: readonly number[], what: string): void {
  for (let i = 0; i < xs.length; i++) {
    if (!Number.isFinite(xs[i])) {
      throw new StatsInputError("not_a_number", `${what} has ${xs[i]} at position ${i + 1}; remove it or enter the number it should be.`);
    }
  }
}

export function requireAtLeast(xs: readonly number[], minimum: number, what: string): void {
  if (xs.length === 0) {
    throw new StatsInputError("empty_group", `${what} has no values; add at least ${minimum}.`);
  }
  if (xs.length < minimum) {
    throw new StatsInputError(
      "too_few_values",
      `${what} has ${xs.length} value${xs.length === 1 ? "" : "s"}; at least ${minimum} are needed to estimate its spread.`,
    );
  }
}

export function requireLevel(level: number): void {
  if (!(level > 0 && level < 1)) {
    throw new StatsInputError("invalid_level", `Confidence level ${level} is not between 0 and 1; use e.g. 0.95 for 95 %.`);
  }
}

export function requireMass(grams: number, what: string): void {
  requireFinite(grams, what);
  if (grams < 0) {
    throw new StatsInputError("negative_mass", `${what} is ${grams} g; a mass cannot be negative, so correct the weighing.`);
  }
}
