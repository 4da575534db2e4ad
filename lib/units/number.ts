export type DecimalMark = "." | ",";

// Digit groups of three split by one kind of separator: "1 234", "1,234", "1.234", "1'234". A
// group that starts with 0 is never thousands grouping ("0.612" is a fraction, whatever the file).
const groupedInteger = /^[1-9]\d{0,2}(?:([ ,.'\u00a0\u202f\u2019])\d{3})(?:\1\d{3})*$/;
const leadingGroup = /^[1-9]\d{0,2}$/;
const digitsOnly = /^\d*$/;

/**
 * Whether the mark at `at` could be a thousands separator: exactly three digits after it and
 * a leading group (1–3 digits, not starting with 0) before it.
 */
function couldGroupThousands(text: string, at: number): boolean {
  return text.length - at - 1 === 3 && digitsOnly.test(text.slice(at + 1)) && leadingGroup.test(text.slice(0, at));
}

/**
 * What one number says about the decimal mark, before anything else is known: "," or "." when
 * it reads only one way ("2,5", "0.612", "1.234,5", "1,234,567"), "either" when it reads two
 * ways ("2.720" is 2.72 or 2 720; "1,205" is 1.205 or 1 205), null when the mark does not
 * matter (no mark, or not a number).
 */
export function decimalEvidence(text: string): DecimalMark | "either" | null {
  const comma = text.indexOf(",");
  const point = text.indexOf(".");
  if (comma === -1 && point === -1) return null;
  if (comma !== -1 && point !== -1) return text.lastIndexOf(",") > text.lastIndexOf(".") ? "," : ".";
  const mark: DecimalMark = comma !== -1 ? "," : ".";
  const at = text.indexOf(mark);
  // The same mark twice ("1.234.567") groups thousands, so the other is the decimal mark.
  if (text.lastIndexOf(mark) !== at) return mark === "," ? "." : ",";
  if (!couldGroupThousands(text, at)) return mark;
  // "1 234.567": another separator already groups the thousands.
  return "either";
}

/**
 * Reads an unsigned number written with either decimal mark and optional thousands
 * separators, given the decimal mark the number's column uses. A lone other mark that cannot
 * be a thousands separator ("2,5" or "0,612" in a column that uses ".") is read as the decimal
 * mark, because a grower who typed it meant a fraction. Returns null when the text is not a number.
 */
export function parseDecimalNumber(text: string, decimal: DecimalMark = "."): number | null {
  let mark: string = decimal;
  let markAt = text.lastIndexOf(mark);
  const other = decimal === "." ? "," : ".";
  const otherLast = text.lastIndexOf(other);
  if (markAt !== -1 && otherLast > markAt) {
    // Both marks written: the last one is the decimal mark whatever the file uses ("1.234,5").
    mark = other;
    markAt = otherLast;
    if (text.indexOf(mark) !== markAt) return null;
  } else if (markAt === -1) {
    const otherAt = text.indexOf(other);
    if (otherAt !== -1 && otherAt === otherLast && !couldGroupThousands(text, otherAt)) {
      mark = other;
      markAt = otherAt;
    }
  } else if (text.indexOf(mark) !== markAt) {
    return null;
  }
  let whole = markAt === -1 ? text : text.slice(0, markAt);
  const fraction = markAt === -1 ? "" : text.slice(markAt + 1);
  if (!digitsOnly.test(fraction)) return null;
  if (!digitsOnly.test(whole)) {
    const grouped = groupedInteger.exec(whole);
    if (grouped === null || grouped[1] === mark) return null;
    whole = whole.split(grouped[1]).join("");
  }
  if (whole === "" && fraction === "") return null;
  return Number(`${whole || "0"}.${fraction || "0"}`);
}
