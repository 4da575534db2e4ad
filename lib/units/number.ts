export type DecimalMark = "." | ",";

// Digit groups of three split by one kind of separator: "1 234", "1,234", "1.234", "1'234".
const groupedInteger = /^\d{1,3}(?:([ ,.'\u00a0\u202f])\d{3})(?:\1\d{3})*$/;
const digitsOnly = /^\d*$/;

/**
 * Reads an unsigned number written with either decimal mark and optional thousands
 * separators. The file's decimal mark wins; a lone other mark that cannot be a thousands
 * separator ("2,5" in a file that uses ".") is read as the decimal mark, because a grower
 * who typed it meant a fraction. Returns null when the text is not a number.
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
    if (otherAt !== -1 && otherAt === text.lastIndexOf(other) && text.length - otherAt - 1 !== 3) {
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
