export {
  GRAMS_PER_KILOGRAM,
  GRAMS_PER_OUNCE,
  GRAMS_PER_POUND,
  formatMass,
  gramsPerUnit,
  massNumberText,
  massUnitFromWord,
  parseMass,
  readMass,
  displayUnitNames,
  type MassDisplay,
  type MassErrorCode,
  type MassOptions,
  type MassReading,
  type MassUnit,
  type MassUnitAsWritten,
} from "./mass";
export { drySubstrateGrams, parseMoisture } from "./moisture";
export { decimalEvidence, parseDecimalNumber, type DecimalMark } from "./number";
export { parseYesNo, yesNoWords } from "./yes-no";
