export { parseMass, formatMass, parseMoisture, parseYesNo, type MassUnit, type MassDisplay } from "../units";
export { type DateOrder, type DateReading, parseDate, readDate, spreadsheetSerialToIso } from "./dates";
export { type Delimiter } from "./csv";
export { type TextEncodingName } from "./encoding";
export { type ColumnTarget, type HeaderMapping, type MappedColumn, mapHeaders } from "./headers";
export {
  type SeasonLogColumn,
  type SeasonLogColumnName,
  seasonLogColumnNames,
  seasonLogColumns,
  seasonLogSchemaVersion,
  seasonLogTemplateCsv,
  type TemplateCodes,
} from "./schema";
export {
  type MassAsWritten,
  type SeasonLogDetected,
  type SeasonLogIssue,
  type SeasonLogOptions,
  type SeasonLogParser,
  type SeasonLogParserOptions,
  type SeasonLogProgress,
  type SeasonLogResult,
  type SeasonRecord,
  createSeasonLogParser,
  parseSeasonLog,
} from "./season-log";
