import {
  type DecimalMark,
  type MassUnit,
  decimalEvidence,
  formatMass,
  massNumberText,
  parseDecimalNumber,
  parseMoisture,
  parseYesNo,
  readMass,
} from "../units";
import { type DateOrder, readDate, wrongOrderMessage } from "./dates";
import { type IssueCode, shorten, writtenDate } from "./issues";
import type { MassAsWritten } from "./types";

/**
 * The import's rules for one cell, as plain functions: what the importer checks in a file, for
 * any other way a value comes in (the quick harvest form, an edit in the app). Each returns the
 * value read, or the issue code and message the importer would report for that cell.
 */
export type CellReading<T> = { value: T; warning?: { code: IssueCode; message: string } } | { code: IssueCode; message: string };

/** A block's wet or spent weight, or a flush's fresh or dry weight. */
export type MassKind = "wet" | "spent" | "fresh" | "dry";

// What one block can weigh: a bag, jar or log of substrate from 250 g to 50 kg (spent, from 100 g),
// a flush from 1 g to 25 kg fresh and a fifth of that dried (common practice: sawdust blocks are
// 1–5 kg, test jars about 300 g, straw logs up to about 20 kg, mushrooms dry to about a tenth).
// Outside that the unit is wrong (grams under a "(kg)" header, pounds taken for grams …).
const massLimits: Readonly<Record<MassKind, { least: number; most: number; words: string }>> = {
  wet: { least: 250, most: 50_000, words: "a block weighs when it is made (250 g to 50 kg)" },
  spent: { least: 100, most: 50_000, words: "a spent block weighs (100 g to 50 kg)" },
  fresh: { least: 1, most: 25_000, words: "one block gives in one flush (1 g to 25 kg)" },
  dry: { least: 0.1, most: 5_000, words: "one block's flush weighs dried (0.1 g to 5 kg)" },
};

/** Why a mass cannot be right for what it weighs, or null when it can (0 is "nothing", always possible). */
export function implausibleMass(kind: MassKind, text: string, grams: number): string | null {
  const limits = massLimits[kind];
  if ((grams >= limits.least && grams <= limits.most) || grams === 0) return null;
  return `"${shorten(text)}" reads as ${formatMass(grams, "metric")}, ${grams > limits.most ? "more" : "less"} than ${limits.words}. Check the unit in the cell and in the column header.`;
}

/**
 * A mass cell: grams and the mass as written. `unit` applies to a bare number; `decimal` is the
 * mark the number uses, when known. A number that reads two ways with no mark given is not
 * guessed (`ambiguous_decimal_mark`); a mass outside what a block or flush weighs is `mass_implausible`.
 */
export function readMassCell(
  text: string,
  options: { kind: MassKind; unit?: MassUnit; decimal?: DecimalMark },
): CellReading<{ grams: number; written: MassAsWritten }> {
  const written = text.trim();
  const number = massNumberText(written);
  const evidence = number === null ? null : decimalEvidence(number);
  if (evidence === "either" && options.decimal === undefined) {
    const asFraction = parseDecimalNumber(number as string, (number as string).includes(",") ? "," : ".");
    const asThousands = parseDecimalNumber(number as string, (number as string).includes(",") ? "." : ",");
    return {
      code: "ambiguous_decimal_mark",
      message: `"${shorten(written)}" reads as ${asFraction} or as ${asThousands}. Say which decimal mark it uses, or write it unambiguously (such as "2720 g" or "2.72 kg").`,
    };
  }
  const reading = readMass(written, { defaultUnit: options.unit, decimal: options.decimal ?? (evidence === "," ? "," : ".") });
  if ("error" in reading) return { code: reading.code, message: reading.error };
  const implausible = implausibleMass(options.kind, written, reading.grams);
  if (implausible !== null) return { code: "mass_implausible", message: implausible };
  return { value: { grams: reading.grams, written: { value: written, unit: reading.unit } } };
}

/**
 * A date cell (also with a time, or a spreadsheet serial) as YYYY-MM-DD. A date that reads two
 * ways needs `order`; one that reads only the other way is `date_wrong_order`. After `today`
 * (YYYY-MM-DD) it is read, with a `date_in_future` warning.
 */
export function readDateCell(text: string, options: { order?: DateOrder; today?: string } = {}): CellReading<string> {
  const reading = readDate(text);
  let iso: string;
  switch (reading.kind) {
    case "error":
      return { code: reading.code, message: reading.error };
    case "either":
      if (options.order === undefined)
        return {
          code: "ambiguous_date_order",
          message: `"${shorten(text.trim())}" can be read day-first (${reading.dmy}) or month-first (${reading.mdy}). Say which order the date uses.`,
        };
      iso = reading[options.order];
      break;
    case "dmy-only":
    case "mdy-only": {
      const only = reading.kind === "dmy-only" ? "dmy" : "mdy";
      if (options.order !== undefined && options.order !== only)
        return { code: "date_wrong_order", message: wrongOrderMessage(text, options.order) };
      iso = reading.iso;
      break;
    }
    default:
      iso = reading.iso;
  }
  if (options.today !== undefined && iso > options.today)
    return {
      value: iso,
      warning: {
        code: "date_in_future",
        message: `The date ${writtenDate(text.trim(), iso)} is in the future (today is ${options.today}). Check it.`,
      },
    };
  return { value: iso };
}

/** A yes/no cell in any of the languages `parseYesNo` knows; blank is null (not stated). */
export function readYesNoCell(text: string): CellReading<boolean | null> {
  const reading = parseYesNo(text);
  return "error" in reading ? { code: reading.code, message: reading.error } : { value: reading.value };
}

/** A number with a known decimal mark (thousands grouping allowed, never a group starting with 0). */
export function readNumberCell(text: string, decimal: DecimalMark): CellReading<number> {
  const value = parseDecimalNumber(text.trim(), decimal);
  if (value === null)
    return {
      code: "number_unreadable",
      message: `"${shorten(text.trim())}" is not a number we can read with "${decimal}" as the decimal mark.`,
    };
  return { value };
}

/** Substrate moisture (wet basis) as a fraction. Without a known mark, a moisture that reads two ways ("62.500") is a fraction: as thousands it would be over 100 %. */
export function readMoistureCell(text: string, decimal?: DecimalMark): CellReading<number> {
  const evidence = decimalEvidence(text.trim().replace(/\s*%$/, ""));
  const reading = parseMoisture(text, {
    decimal: decimal ?? (evidence === "," || (evidence === "either" && text.includes(",")) ? "," : "."),
  });
  return "error" in reading ? { code: reading.code, message: reading.error } : { value: reading.fraction };
}

/** A room's name as a season log's cell is matched to it: capitals and spaces do not matter ("Tent 1" is "tent1"). */
export function roomKey(name: string): string {
  return name.normalize("NFC").toLowerCase().replace(/\s+/g, "");
}

/** One of the farm's own fruiting rooms, as a cell may name it. */
export interface NamedRoom {
  id: string;
  name: string;
  /** The day the room stopped being used (YYYY-MM-DD); null or absent while in use. */
  retiredOn?: string | null;
}

// A message lists the farm's rooms; a farm with very many is told the first few and how many more.
const roomsListed = 12;

function roomList(rooms: readonly NamedRoom[]): string {
  const names = rooms.map((room) => `"${room.name}"`);
  if (names.length <= roomsListed) return names.join(", ");
  return `${names.slice(0, roomsListed).join(", ")} and ${names.length - roomsListed} more`;
}

/**
 * A fruiting-room cell, matched by name to the farm's own rooms (`rooms`: only the farm's, as
 * row-level security gives them). Null for a blank cell. A name no room has, or one two rooms
 * share once capitals and spaces are ignored, is an error that says which rooms the farm has:
 * a room is never made from a cell, and never guessed.
 */
export function readRoomCell(text: string, rooms: readonly NamedRoom[]): CellReading<NamedRoom> | null {
  const written = text.trim();
  if (written === "") return null;
  const key = roomKey(written);
  const matches = rooms.filter((room) => roomKey(room.name) === key);
  if (matches.length === 1) return { value: matches[0] };
  if (matches.length > 1)
    return {
      code: "fruiting_room_ambiguous",
      message: `"${shorten(written)}" could be any of your farm's rooms ${roomList(matches)}, whose names differ only in capitals or spaces. Rename one of them on the Rooms page, then write the name of the one the block fruited in.`,
    };
  const kept =
    rooms.length === 0
      ? "Your farm has no rooms recorded yet."
      : `Your farm's rooms are ${roomList([...rooms].sort((a, b) => a.name.localeCompare(b.name)))}.`;
  return {
    code: "unknown_fruiting_room",
    message: `"${shorten(written)}" is not one of your farm's rooms. ${kept} Add the room on the Rooms page first (a room is never made from a season log), correct the name, or leave the cell blank.`,
  };
}
