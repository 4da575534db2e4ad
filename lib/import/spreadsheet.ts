import { Readable } from "node:stream";
import type { XMLParser } from "fast-xml-parser";
import { Unzip, UnzipInflate, unzipSync } from "fflate";

/**
 * Spreadsheet files read as their cells' types, not as formatted text: an .xlsx through
 * exceljs's streaming reader, an .ods by inflating its content.xml as a stream (fflate) and
 * reading one table row at a time with fast-xml-parser, so neither holds the whole sheet's
 * XML or a workbook model in memory. A cell becomes the text the row reader takes: a number as
 * JavaScript writes it ("0.612", flagged as a typed number, so no decimal mark is guessed), a
 * date as YYYY-MM-DD, a boolean as TRUE/FALSE, a formula as its cached value.
 */

export type WorkbookKind = "xlsx" | "ods";

/** Uncompressed XML of one sheet above this is refused before it is read (a 20 MB file holds about 300 MB). */
export const largestSheetXmlBytes = 400 * 1024 * 1024;

export interface WorkbookRow {
  /** 1-based row number in the sheet, as the spreadsheet shows it. */
  line: number;
  cells: string[];
  /** Per cell, true when it held a number (its text is JavaScript's, with "." as the decimal mark). */
  numbers: boolean[];
}

export type WorkbookReading =
  { sheets: string[]; sheet: string | null } | { code: "spreadsheet_unreadable" | "spreadsheet_too_large"; message: string };

const zipMagic = [0x50, 0x4b, 0x03, 0x04];
const odsMime = "application/vnd.oasis.opendocument.spreadsheet";

function entries(bytes: Uint8Array): { name: string; originalSize: number }[] {
  const found: { name: string; originalSize: number }[] = [];
  try {
    unzipSync(bytes, {
      filter: (file) => {
        found.push({ name: file.name, originalSize: file.originalSize });
        return file.name === "mimetype";
      },
    });
  } catch {
    return [];
  }
  return found;
}

/** "xlsx" or "ods" when the bytes are such a workbook (by its contents, not its name), else null. */
export function workbookKind(bytes: Uint8Array): WorkbookKind | null {
  if (bytes.length < 4 || zipMagic.some((byte, index) => bytes[index] !== byte)) return null;
  const names = entries(bytes).map((entry) => entry.name);
  if (names.includes("xl/workbook.xml")) return "xlsx";
  if (names.includes("content.xml")) {
    try {
      const mime = unzipSync(bytes, { filter: (file) => file.name === "mimetype" }).mimetype;
      if (mime !== undefined && new TextDecoder().decode(mime).trim().startsWith(odsMime)) return "ods";
    } catch {
      return null;
    }
  }
  return null;
}

function tooLargeSheet(bytes: Uint8Array, names: (name: string) => boolean): WorkbookReading | null {
  const largest = entries(bytes)
    .filter((entry) => names(entry.name))
    .reduce((most, entry) => Math.max(most, entry.originalSize), 0);
  if (largest <= largestSheetXmlBytes) return null;
  return {
    code: "spreadsheet_too_large",
    message: `A sheet of this workbook holds ${Math.round(largest / 1024 / 1024)} MB of cells, more than the ${largestSheetXmlBytes / 1024 / 1024} MB the importer reads from one sheet. Save the season log as CSV (up to 50 MB), or split it into several workbooks.`,
  };
}

const unreadable = (what: string): WorkbookReading => ({
  code: "spreadsheet_unreadable",
  message: `The spreadsheet could not be read (${what}). Open it in your spreadsheet program, save it again as .xlsx or .ods (or export the sheet as CSV), and upload that file.`,
});

type CellValue = string | number | boolean | Date | null | undefined | Record<string, unknown>;

/** One exceljs cell value as text; formulas give their cached result. */
function excelCell(value: CellValue): { text: string; number: boolean } {
  if (value === null || value === undefined) return { text: "", number: false };
  if (typeof value === "number") return { text: String(value), number: true };
  if (typeof value === "boolean") return { text: value ? "TRUE" : "FALSE", number: false };
  if (typeof value === "string") return { text: value, number: false };
  if (value instanceof Date) return { text: Number.isNaN(value.getTime()) ? "" : value.toISOString().slice(0, 10), number: false };
  if ("result" in value) return excelCell(value.result as CellValue);
  if ("formula" in value || "sharedFormula" in value) return { text: "", number: false };
  if ("richText" in value && Array.isArray(value.richText))
    return { text: value.richText.map((part: { text?: string }) => part.text ?? "").join(""), number: false };
  if ("text" in value) return excelCell(value.text as CellValue);
  if ("error" in value) return { text: String(value.error), number: false };
  return { text: "", number: false };
}

async function readXlsx(bytes: Uint8Array, sheet: string | undefined, onRow: (row: WorkbookRow) => void): Promise<WorkbookReading> {
  const large = tooLargeSheet(bytes, (name) => name.startsWith("xl/worksheets/") || name === "xl/sharedStrings.xml");
  if (large !== null) return large;
  const sheets: string[] = [];
  let chosen: string | null = null;
  try {
    // Loaded when a workbook arrives: a CSV upload never needs exceljs.
    const { default: ExcelJS } = await import("exceljs");
    const reader = new ExcelJS.stream.xlsx.WorkbookReader(Readable.from([Buffer.from(bytes.buffer, bytes.byteOffset, bytes.byteLength)]), {
      sharedStrings: "cache",
      styles: "cache",
      hyperlinks: "ignore",
      worksheets: "emit",
      entries: "emit",
    });
    for await (const worksheet of reader) {
      const name = (worksheet as unknown as { name?: string }).name ?? `Sheet ${sheets.length + 1}`;
      sheets.push(name);
      const wanted = chosen === null && (sheet === undefined || sheet === name);
      if (wanted) chosen = name;
      for await (const row of worksheet) {
        if (!wanted) continue;
        const values = row.values as CellValue[];
        const cells: string[] = [];
        const numbers: boolean[] = [];
        for (let index = 1; index < values.length; index++) {
          const cell = excelCell(values[index]);
          cells.push(cell.text);
          numbers.push(cell.number);
        }
        onRow({ line: row.number, cells, numbers });
      }
    }
  } catch (error) {
    return unreadable((error as Error).message.slice(0, 120));
  }
  return { sheets, sheet: chosen };
}

/** The XML parser for .ods rows, made when the first workbook arrives (a CSV upload never needs it). */
let odsXml: XMLParser | null = null;
async function xmlParser(): Promise<XMLParser> {
  if (odsXml === null) {
    const { XMLParser } = await import("fast-xml-parser");
    odsXml = new XMLParser({
      ignoreAttributes: false,
      attributeNamePrefix: "",
      preserveOrder: true,
      parseTagValue: false,
      trimValues: false,
    });
  }
  return odsXml;
}
/** Repeated empty cells or rows past this are dropped (LibreOffice writes a sheet's unused 1 024 columns as one repeated cell). */
const mostRepeatedCells = 16_384;
const mostRepeatedRows = 100_000;

type OrderedNode = Record<string, unknown> & { ":@"?: Record<string, string> };

function childrenOf(node: OrderedNode, tag: string): OrderedNode[] {
  return (node[tag] as OrderedNode[] | undefined) ?? [];
}

/** The text of a cell's paragraphs, with ODF's encoded spaces, tabs and line breaks. */
function odfText(nodes: OrderedNode[]): string {
  let text = "";
  for (const node of nodes) {
    if ("#text" in node) text += String(node["#text"]);
    else if ("text:s" in node) text += " ".repeat(Number(node[":@"]?.["text:c"] ?? 1));
    else if ("text:tab" in node) text += "\t";
    else if ("text:line-break" in node) text += "\n";
    else {
      const tag = Object.keys(node).find((key) => key !== ":@");
      if (tag !== undefined) text += odfText(childrenOf(node, tag));
    }
  }
  return text;
}

function odsCell(node: OrderedNode, tag: string): { text: string; number: boolean } {
  const attributes = node[":@"] ?? {};
  const type = attributes["office:value-type"];
  if (type === "float" || type === "percentage" || type === "currency")
    return { text: String(Number(attributes["office:value"])), number: true };
  if (type === "date") return { text: (attributes["office:date-value"] ?? "").slice(0, 10), number: false };
  if (type === "boolean") return { text: attributes["office:boolean-value"] === "true" ? "TRUE" : "FALSE", number: false };
  const paragraphs = childrenOf(node, tag).filter((child) => "text:p" in child);
  return { text: paragraphs.map((paragraph) => odfText(childrenOf(paragraph, "text:p"))).join("\n"), number: false };
}

/** One <table:table-row> element: its cells, and how many times the row repeats. */
function odsRow(xml: XMLParser, element: string): { cells: string[]; numbers: boolean[]; repeat: number } {
  const [row] = xml.parse(element) as OrderedNode[];
  const repeat = Math.max(1, Number(row?.[":@"]?.["table:number-rows-repeated"] ?? 1));
  const cells: string[] = [];
  const numbers: boolean[] = [];
  for (const child of childrenOf(row ?? {}, "table:table-row")) {
    const tag = "table:table-cell" in child ? "table:table-cell" : "table:covered-table-cell" in child ? "table:covered-table-cell" : null;
    if (tag === null) continue;
    const cell = tag === "table:table-cell" ? odsCell(child, tag) : { text: "", number: false };
    const times = Math.min(mostRepeatedCells, Math.max(1, Number(child[":@"]?.["table:number-columns-repeated"] ?? 1)));
    for (let time = 0; time < times && cells.length < mostRepeatedCells; time++) {
      cells.push(cell.text);
      numbers.push(cell.number);
    }
  }
  while (cells.length > 0 && cells[cells.length - 1] === "") {
    cells.pop();
    numbers.pop();
  }
  return { cells, numbers, repeat };
}

const tableStart = /<table:table\s[^>]*?table:name="([^"]*)"[^>]*>/y;
const nextTag = /<table:table(?:-row)?[\s>/]|<\/table:table>/g;

function decodeXmlAttribute(xml: XMLParser, value: string): string {
  return (xml.parse(`<a b="${value}"/>`) as OrderedNode[])[0]?.[":@"]?.b ?? value;
}

async function readOds(bytes: Uint8Array, sheet: string | undefined, onRow: (row: WorkbookRow) => void): Promise<WorkbookReading> {
  const large = tooLargeSheet(bytes, (name) => name === "content.xml");
  if (large !== null) return large;
  const xml = await xmlParser();
  const sheets: string[] = [];
  let chosen: string | null = null;
  let wanted = false;
  let line = 0;
  let pending = "";
  let found = false;
  const text = new TextDecoder("utf-8");
  // Cuts the XML at table and row boundaries as it streams in; a row is parsed when its end tag has arrived.
  const consume = (final: boolean) => {
    let position = 0;
    for (;;) {
      nextTag.lastIndex = position;
      const match = nextTag.exec(pending);
      if (match === null) {
        position = Math.max(position, pending.length - 20);
        break;
      }
      const at = match.index;
      if (match[0] === "</table:table>") {
        wanted = false;
        position = at + match[0].length;
        continue;
      }
      if (match[0].startsWith("<table:table-row")) {
        const close = pending.indexOf("</table:table-row>", at);
        const selfClosing = pending.indexOf("/>", at);
        const openEnd = pending.indexOf(">", at);
        if (openEnd === -1) break;
        const empty = selfClosing !== -1 && selfClosing + 1 === openEnd;
        if (!empty && close === -1) break;
        const end = empty ? openEnd + 1 : close + "</table:table-row>".length;
        if (wanted) {
          const row = odsRow(xml, pending.slice(at, end));
          if (row.cells.length === 0) line += row.repeat;
          else
            for (let time = 0; time < Math.min(row.repeat, mostRepeatedRows); time++)
              onRow({ line: ++line, cells: [...row.cells], numbers: [...row.numbers] });
        }
        position = end;
        continue;
      }
      tableStart.lastIndex = at;
      const table = tableStart.exec(pending);
      if (table === null) {
        if (pending.indexOf(">", at) === -1) break;
        position = at + match[0].length;
        continue;
      }
      const name = decodeXmlAttribute(xml, table[1]);
      sheets.push(name);
      wanted = chosen === null && (sheet === undefined || sheet === name);
      if (wanted) chosen = name;
      line = 0;
      position = tableStart.lastIndex;
    }
    pending = final ? "" : pending.slice(position);
  };
  let failure: string | null = null;
  try {
    const unzip = new Unzip((file) => {
      if (file.name !== "content.xml") return;
      found = true;
      file.ondata = (error, chunk, final) => {
        if (error) {
          failure = error.message;
          return;
        }
        pending += text.decode(chunk, { stream: !final });
        consume(final);
      };
      file.start();
    });
    unzip.register(UnzipInflate);
    const step = 1 << 20;
    for (let offset = 0; offset < bytes.length; offset += step) {
      unzip.push(bytes.subarray(offset, offset + step), offset + step >= bytes.length);
      // Let other requests run between slices of a large workbook.
      await new Promise((resolve) => setImmediate(resolve));
    }
  } catch (error) {
    return unreadable((error as Error).message.slice(0, 120));
  }
  if (failure !== null) return unreadable(failure);
  if (!found) return unreadable("it has no content.xml");
  return { sheets, sheet: chosen };
}

/** Reads the chosen sheet (the first when none is chosen) row by row; lists every sheet's name. */
export function readWorkbook(
  bytes: Uint8Array,
  kind: WorkbookKind,
  sheet: string | undefined,
  onRow: (row: WorkbookRow) => void,
): Promise<WorkbookReading> {
  return kind === "xlsx" ? readXlsx(bytes, sheet, onRow) : readOds(bytes, sheet, onRow);
}
