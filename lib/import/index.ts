export { parseMass, formatMass, parseMoisture, parseYesNo, type MassUnit, type MassDisplay } from "../units";
export { type DateOrder, type DateReading, parseDate, readDate, spreadsheetSerialToIso } from "./dates";
export { type Delimiter } from "./sniff";
export { type TextEncodingName } from "./decode";
export { type IssueCode, issueCodes } from "./issues";
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
  parseWorkbook,
} from "./season-log";
export { type WorkbookKind, workbookKind } from "./spreadsheet";
export { seasonLogTemplateXlsx } from "./template-xlsx";
export { type CellReading, type MassKind, readDateCell, readMassCell, readMoistureCell, readNumberCell, readYesNoCell } from "./cells";
