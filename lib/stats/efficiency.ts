import { StatsInputError, requireFinite, requireMass } from "./errors";

function requireMoisture(moisture: number): void {
  requireFinite(moisture, "The moisture content");
  if (!(moisture >= 0 && moisture < 1)) {
    throw new StatsInputError(
      "moisture_out_of_range",
      `Moisture ${moisture} is outside [0, 1): give it as a fraction of wet mass, e.g. 0.6 for 60 %.`,
    );
  }
}

/**
 * Dry substrate mass in grams: wet mass × (1 − moisture), moisture on a wet basis as a
 * fraction in [0, 1) (0.6 for 60 %).
 */
export function dryMass(wetG: number, moisture: number): number {
  requireMass(wetG, "The wet block mass");
  requireMoisture(moisture);
  return wetG * (1 - moisture);
}

/**
 * Biological efficiency in percent: fresh mushroom mass ÷ dry substrate mass × 100.
 * `freshG` is the fresh harvest in grams (all flushes counted so far), `wetBlockG` the
 * block's wet mass when made, `moisture` its wet-basis moisture fraction in [0, 1).
 */
export function biologicalEfficiency(input: { freshG: number; wetBlockG: number; moisture: number }): number {
  requireMass(input.freshG, "The fresh harvest mass");
  const dry = dryMass(input.wetBlockG, input.moisture);
  if (dry === 0) {
    throw new StatsInputError(
      "invalid_argument",
      "The block's wet mass is 0 g, so it has no dry substrate; enter the mass weighed when the block was made.",
    );
  }
  return (input.freshG / dry) * 100;
}

/**
 * Mass loss of a block in percent of its initial wet mass: (initial − spent) ÷ initial × 100.
 * Percent, like biological efficiency. A block that was soaked between flushes can weigh
 * more than when made; the result is then negative, which is the true figure.
 */
export function massLoss(initialG: number, spentG: number): number {
  requireMass(initialG, "The initial block mass");
  requireMass(spentG, "The spent block mass");
  if (initialG === 0) {
    throw new StatsInputError("invalid_argument", "The initial block mass is 0 g; enter the mass weighed when the block was made.");
  }
  return ((initialG - spentG) / initialG) * 100;
}
