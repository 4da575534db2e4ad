import type { MassAsWritten, SeasonLogResult, SeasonRecord } from "../import";
import type { RegisterEntryText } from "../import/registers";
import type { ParseChoices } from "./report";

/**
 * An upload keeps its parse (records, issues, what was detected) so the commit need not read
 * the file again. It is packed column by column: each column is a list of its distinct values
 * and, per record, the position of its value, with repeats run-length coded. A block's rows
 * repeat its details, so this is a fraction of the size of one object per record.
 * The key says what the parse depended on besides the bytes; any difference means parse again.
 */

/** Distinct values, and per record the 1-based position of its value (0 for null); `-n, i` is n records of value i. */
interface Column<T> {
  values: T[];
  runs: number[];
}

type TextField =
  | "blockCode"
  | "strainCode"
  | "substrate"
  | "trialCode"
  | "arm"
  | "inoculatedOn"
  | "fruitingMethod"
  | "harvestedOn"
  | "contaminatedOn"
  | "notes";
type NumberField = "moisture" | "flush";
type MassField = "wetBlockGrams" | "freshGrams" | "dryGrams" | "spentGrams";
/** A mass column's value: grams, as written and the unit that applied. */
type Mass = [number | null, string | null, MassAsWritten["unit"] | null];

const textFields: readonly TextField[] = [
  "blockCode",
  "strainCode",
  "substrate",
  "trialCode",
  "arm",
  "inoculatedOn",
  "fruitingMethod",
  "harvestedOn",
  "contaminatedOn",
  "notes",
];
const numberFields: readonly NumberField[] = ["moisture", "flush"];
const massFields: Readonly<Record<MassField, "wetBlockAsWritten" | "freshAsWritten" | "dryAsWritten" | "spentAsWritten">> = {
  wetBlockGrams: "wetBlockAsWritten",
  freshGrams: "freshAsWritten",
  dryGrams: "dryAsWritten",
  spentGrams: "spentAsWritten",
};

interface Packed {
  version: 2;
  key: string;
  count: number;
  /** Each record's line minus the line of the record before it. */
  lineSteps: Column<number>;
  text: Record<TextField, Column<string>>;
  numbers: Record<NumberField, Column<number>>;
  masses: Record<MassField, Column<Mass>>;
  contaminated: Column<boolean>;
  issues: SeasonLogResult["issues"];
  detected: SeasonLogResult["detected"];
}

/** What a parse depended on besides the file: the grower's choices, the strain register and the day. */
export function stagingKey(choices: ParseChoices, knownStrains: readonly (string | RegisterEntryText)[], today: string): string {
  const mapping = choices.mapping ? Object.entries(choices.mapping).sort(([a], [b]) => (a < b ? -1 : a > b ? 1 : 0)) : null;
  return JSON.stringify([
    mapping,
    choices.dateOrder ?? null,
    choices.defaultMassUnit ?? null,
    choices.decimal ?? null,
    choices.decimalByColumn ? Object.entries(choices.decimalByColumn).sort(([a], [b]) => (a < b ? -1 : a > b ? 1 : 0)) : null,
    choices.sheet ?? null,
    knownStrains.map((strain) => (typeof strain === "string" ? strain : JSON.stringify([strain.code, strain.names ?? []]))).sort(),
    today,
  ]);
}

/** `identity` gives what makes two values one: the value itself, unless it is not a primitive. */
function packColumn<T>(
  count: number,
  read: (row: number) => T | null,
  identity: (value: T, row: number) => unknown = (value) => value,
): Column<T> {
  const positions = new Map<unknown, number>();
  const values: T[] = [];
  const runs: number[] = [];
  let previous = -1;
  let repeats = 0;
  const endRun = () => {
    if (repeats > 1) runs.push(-repeats);
    if (repeats > 0) runs.push(previous);
  };
  for (let row = 0; row < count; row++) {
    const value = read(row);
    let position = 0;
    if (value !== null) {
      const id = identity(value, row);
      const known = positions.get(id);
      if (known === undefined) {
        values.push(value);
        position = values.length;
        positions.set(id, position);
      } else position = known;
    }
    if (position === previous) {
      repeats++;
      continue;
    }
    endRun();
    previous = position;
    repeats = 1;
  }
  endRun();
  return { values, runs };
}

/** Each record's position in the column's values (0 for null). */
function unpackColumn(column: Column<unknown>, count: number): Int32Array {
  const positions = new Int32Array(count);
  let row = 0;
  for (let index = 0; index < column.runs.length; index++) {
    const entry = column.runs[index];
    if (entry < 0) {
      positions.fill(column.runs[++index], row, row - entry);
      row -= entry;
    } else positions[row++] = entry;
  }
  return positions;
}

export function packParse(key: string, result: SeasonLogResult): string {
  const records = result.records;
  const count = records.length;
  const text = {} as Packed["text"];
  for (const field of textFields) text[field] = packColumn(count, (row) => records[row][field]);
  const numbers = {} as Packed["numbers"];
  for (const field of numberFields) numbers[field] = packColumn(count, (row) => records[row][field]);
  const masses = {} as Packed["masses"];
  for (const [grams, written] of Object.entries(massFields) as [MassField, (typeof massFields)[MassField]][]) {
    masses[grams] = packColumn(
      count,
      (row): Mass | null => {
        const record = records[row];
        const mass = record[written];
        return record[grams] === null && mass === null ? null : [record[grams], mass?.value ?? null, mass?.unit ?? null];
      },
      // The parser shares one object per mass as written in a column, and its grams go with it.
      (mass, row) => records[row][written] ?? mass[0],
    );
  }
  const packed: Packed = {
    version: 2,
    key,
    count,
    lineSteps: packColumn(count, (row) => records[row].line - (row === 0 ? 0 : records[row - 1].line)),
    text,
    numbers,
    masses,
    contaminated: packColumn(count, (row) => records[row].contaminated),
    issues: result.issues,
    detected: result.detected,
  };
  return JSON.stringify(packed);
}

/** The staged parse, or null when it was packed differently or under another key. */
export function unpackParse(packedText: string, key: string): SeasonLogResult | null {
  const packed = JSON.parse(packedText) as Packed;
  if (packed.version !== 2 || packed.key !== key) return null;
  const count = packed.count;
  const textOf = (field: TextField) => {
    const { values } = packed.text[field];
    const at = unpackColumn(packed.text[field], count);
    return (row: number) => (at[row] === 0 ? null : values[at[row] - 1]);
  };
  const numberOf = (column: Column<number>) => {
    const at = unpackColumn(column, count);
    return (row: number) => (at[row] === 0 ? null : column.values[at[row] - 1]);
  };
  // One object per distinct mass as written, shared by the records that wrote it alike.
  const massOf = (column: Column<Mass>) => {
    const at = unpackColumn(column, count);
    const written = column.values.map(([, value, unit]): MassAsWritten | null =>
      value === null || unit === null ? null : { value, unit },
    );
    return {
      grams: (row: number) => (at[row] === 0 ? null : column.values[at[row] - 1][0]),
      written: (row: number) => (at[row] === 0 ? null : written[at[row] - 1]),
    };
  };
  const blockCode = textOf("blockCode");
  const strainCode = textOf("strainCode");
  const substrate = textOf("substrate");
  const trialCode = textOf("trialCode");
  const arm = textOf("arm");
  const inoculatedOn = textOf("inoculatedOn");
  const fruitingMethod = textOf("fruitingMethod");
  const harvestedOn = textOf("harvestedOn");
  const contaminatedOn = textOf("contaminatedOn");
  const notes = textOf("notes");
  const moisture = numberOf(packed.numbers.moisture);
  const flush = numberOf(packed.numbers.flush);
  const lineStep = numberOf(packed.lineSteps);
  const wet = massOf(packed.masses.wetBlockGrams);
  const fresh = massOf(packed.masses.freshGrams);
  const dry = massOf(packed.masses.dryGrams);
  const spent = massOf(packed.masses.spentGrams);
  const contaminated = unpackColumn(packed.contaminated, count);
  const records = new Array<SeasonRecord>(count);
  let line = 0;
  for (let row = 0; row < count; row++) {
    line += lineStep(row) as number;
    records[row] = {
      line,
      blockCode: blockCode(row) ?? "",
      strainCode: strainCode(row) ?? "",
      substrate: substrate(row),
      trialCode: trialCode(row),
      arm: arm(row),
      inoculatedOn: inoculatedOn(row),
      wetBlockGrams: wet.grams(row),
      wetBlockAsWritten: wet.written(row),
      moisture: moisture(row),
      fruitingMethod: fruitingMethod(row),
      flush: flush(row),
      harvestedOn: harvestedOn(row),
      freshGrams: fresh.grams(row),
      freshAsWritten: fresh.written(row),
      dryGrams: dry.grams(row),
      dryAsWritten: dry.written(row),
      contaminated: packed.contaminated.values[contaminated[row] - 1] === true,
      contaminatedOn: contaminatedOn(row),
      spentGrams: spent.grams(row),
      spentAsWritten: spent.written(row),
      notes: notes(row),
    };
  }
  return { records, issues: packed.issues, detected: packed.detected };
}
