export {
  GRAMS_PER_KILOGRAM,
  GRAMS_PER_OUNCE,
  GRAMS_PER_POUND,
  formatMass,
  gramsPerUnit,
  massUnitFromWord,
  parseMass,
  readMass,
  type MassDisplay,
  type MassOptions,
  type MassReading,
  type MassUnit,
  type MassUnitAsWritten,
} from "./mass";
export { drySubstrateGrams, parseMoisture } from "./moisture";
export { parseDecimalNumber, type DecimalMark } from "./number";
export { parseYesNo } from "./yes-no";
