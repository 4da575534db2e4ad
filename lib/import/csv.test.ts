import { describe, expect, it } from "vitest";
import { createTokeniser, tokenise } from "./csv";
import { type Delimiter, looksBinary, sampleRows, sniffDecimal, sniffDelimiter } from "./sniff";

function rows(text: string, delimiter: Delimiter = ",", chunk = text.length || 1): [number, string[]][] {
  const found: [number, string[]][] = [];
  const state = createTokeniser(delimiter);
  for (let offset = 0; offset < text.length; offset += chunk)
    tokenise(state, text.slice(offset, offset + chunk), false, (cells, line) => found.push([line, cells]));
  tokenise(state, "", true, (cells, line) => found.push([line, cells]));
  return found;
}

describe("tokenise", () => {
  const text = 'a,b\r\n"x\r\ny","say ""hi"""\r\n\r\nlast,"q"\rend,1';
  const expected: [number, string[]][] = [
    [1, ["a", "b"]],
    [2, ["x\r\ny", 'say "hi"']],
    [4, [""]],
    [5, ["last", "q"]],
    [6, ["end", "1"]],
  ];

  it("splits quoted fields with embedded newlines and gives each row its physical start line", () => {
    expect(rows(text)).toEqual(expected);
  });

  it("gives the same rows whatever the chunk size", () => {
    for (const chunk of [1, 2, 3, 5, 8]) expect(rows(text, ",", chunk)).toEqual(expected);
  });

  it("reports a quote that is never closed", () => {
    const state = createTokeniser(",");
    const found: string[][] = [];
    tokenise(state, 'a,b\n1,"open\n2,3\n', true, (cells) => found.push(cells));
    expect(found).toEqual([
      ["a", "b"],
      ["1", "open\n2,3\n"],
    ]);
    expect(state.unclosedQuoteLine).toBe(2);
  });
});

describe("sniffing", () => {
  it("finds the delimiter", () => {
    expect(sniffDelimiter("a;b;c\n1;2,5;3\n", true)).toBe(";");
    expect(sniffDelimiter("a\tb\tc\n1\t2\t3\n", true)).toBe("\t");
    expect(sniffDelimiter('a,b,c\n1,"x;y",3\n', true)).toBe(",");
    expect(sniffDelimiter("just one column\n", true)).toBe(",");
  });

  it("finds the decimal mark from numbers that read one way only", () => {
    expect(sniffDecimal(sampleRows("a;b\n1;2,5\n", ";", true), ";")).toBe(",");
    expect(sniffDecimal(sampleRows("a;b\n1;2.5 kg\n", ";", true), ";")).toBe(".");
    expect(sniffDecimal(sampleRows("a;b\n1;2\n", ";", true), ";")).toBe(",");
    expect(sniffDecimal(sampleRows("a,b\n1,2\n", ",", true), ",")).toBe(".");
    expect(sniffDecimal(sampleRows('a,b\n1,"1.234,5"\n', ",", true), ",")).toBe(",");
  });
});

describe("looksBinary", () => {
  it("takes U+FFFD, a stray control character in a short file and a trailing Ctrl-Z for text", () => {
    expect(looksBinary("a,b\nK\ufffd1,\ufffd\ufffd\n")).toBe(false);
    expect(looksBinary("block_id,strain\nB-1,PO-03\u0007\n")).toBe(false);
    expect(looksBinary("block_id,strain\nB-1,PO-03\n\u001a")).toBe(false);
  });

  it("takes a NUL, or control characters throughout, for binary", () => {
    expect(looksBinary("PK\u0003\u0004\u0014\u0000\u0006")).toBe(true);
    expect(looksBinary("a\u0001b\u0002c\u0003d\u0004e\u0005f")).toBe(true);
  });
});
