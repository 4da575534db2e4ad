import { type SeasonLogColumnName, type TemplateCodes, seasonLogColumnNames, seasonLogColumns, templateRows } from "./schema";

const isoDay = /^\d{4}-\d{2}-\d{2}$/;

/** A cell as the template writes it: dates as dates and flush numbers as numbers, weights as text with their unit. */
function cellOf(name: SeasonLogColumnName, text: string): string | number | Date | null {
  if (text === "") return null;
  const kind = seasonLogColumns.find((column) => column.name === name)?.kind;
  if (kind === "date" && isoDay.test(text)) return new Date(`${text}T00:00:00Z`);
  if (kind === "flush") return Number(text);
  return text;
}

/**
 * The season-log template as an .xlsx workbook: the same columns and example rows as the CSV
 * template, one sheet, dates formatted as dates, and a second sheet explaining each column.
 */
export async function seasonLogTemplateXlsx(codes?: TemplateCodes): Promise<Uint8Array<ArrayBuffer>> {
  // Loaded when the template is asked for: every other use of the importer goes without exceljs.
  const { default: ExcelJS } = await import("exceljs");
  const workbook = new ExcelJS.Workbook();
  const sheet = workbook.addWorksheet("Season log");
  sheet.addRow([...seasonLogColumnNames]);
  sheet.getRow(1).font = { bold: true };
  for (const row of templateRows(codes)) sheet.addRow(seasonLogColumnNames.map((name) => cellOf(name, row[name] ?? "")));
  seasonLogColumnNames.forEach((name, index) => {
    const column = sheet.getColumn(index + 1);
    column.width = Math.max(12, name.length + 2);
    if (seasonLogColumns[index].kind === "date") column.numFmt = "yyyy-mm-dd";
  });
  sheet.views = [{ state: "frozen", ySplit: 1 }];
  const about = workbook.addWorksheet("About the columns");
  about.addRow(["column", "what it holds", "examples"]);
  about.getRow(1).font = { bold: true };
  for (const column of seasonLogColumns) about.addRow([column.name, column.meaning, column.examples.filter(Boolean).join("; ")]);
  about.getColumn(2).width = 80;
  return new Uint8Array(await workbook.xlsx.writeBuffer());
}
