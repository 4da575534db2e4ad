import { describe, expect, it } from "vitest";
import { createDecoder, decodeBytes } from "./decode";

function decodeInChunks(bytes: number[], size: number): { text: string; encoding: string; mixed: boolean } {
  const state = createDecoder();
  let text = "";
  for (let offset = 0; offset < bytes.length; offset += size)
    text += decodeBytes(state, new Uint8Array(bytes.slice(offset, offset + size)), false);
  text += decodeBytes(state, new Uint8Array(0), true);
  return { text, encoding: state.encoding, mixed: state.mixed };
}

describe("decodeBytes (stage 1)", () => {
  it("reads UTF-8 whose characters are cut between chunks", () => {
    // "é" is C3 A9 and "€" is E2 82 AC in UTF-8 (RFC 3629).
    const bytes = [0x61, 0xc3, 0xa9, 0xe2, 0x82, 0xac];
    for (const size of [1, 2, 3]) expect(decodeInChunks(bytes, size)).toEqual({ text: "aé€", encoding: "utf-8", mixed: false });
  });

  it("takes the byte-order marks of UTF-8 and UTF-16 and drops them", () => {
    expect(decodeInChunks([0xef, 0xbb, 0xbf, 0x61], 1)).toMatchObject({ text: "a", encoding: "utf-8-bom" });
    expect(decodeInChunks([0xff, 0xfe, 0x61, 0x00, 0xe9, 0x00], 1)).toMatchObject({ text: "aé", encoding: "utf-16le" });
    expect(decodeInChunks([0xfe, 0xff, 0x00, 0x61], 3)).toMatchObject({ text: "a", encoding: "utf-16be" });
  });

  it("goes over to Windows-1252 at the first byte that is not UTF-8, and says when UTF-8 accents came first", () => {
    // 0xE9 is "é" in Windows-1252 (Unicode Consortium, cp1252 mapping file).
    expect(decodeInChunks([0x61, 0xe9, 0x62], 1)).toEqual({ text: "aéb", encoding: "windows-1252", mixed: false });
    expect(decodeInChunks([0xc3, 0xa9, 0x2c, 0xe9], 2)).toMatchObject({ encoding: "windows-1252", mixed: true });
  });
});

// The Unicode Consortium's mapping file for Windows code page 1252
// (https://www.unicode.org/Public/MAPPINGS/VENDORS/MICSFT/WINDOWS/CP1252.TXT, table version 2.01):
// bytes 0x80–0x9F. null = UNDEFINED in the table (0x81, 0x8D, 0x8F, 0x90, 0x9D). See docs/references.md.
const cp1252From0x80: readonly (number | null)[] = [
  0x20ac,
  null,
  0x201a,
  0x0192,
  0x201e,
  0x2026,
  0x2020,
  0x2021,
  0x02c6,
  0x2030,
  0x0160,
  0x2039,
  0x0152,
  null,
  0x017d,
  null,
  null,
  0x2018,
  0x2019,
  0x201c,
  0x201d,
  0x2022,
  0x2013,
  0x2014,
  0x02dc,
  0x2122,
  0x0161,
  0x203a,
  0x0153,
  null,
  0x017e,
  0x0178,
];

describe("Windows-1252 bytes 0x80–0x9F", () => {
  it("decode as the published cp1252 table says, never as control characters", () => {
    cp1252From0x80.forEach((expected, offset) => {
      const byte = 0x80 + offset;
      // After "é" as 0xE9 the decoder is already in Windows-1252; and each byte alone, first in the file.
      for (const bytes of [[0xe9, byte], [byte]]) {
        const { text, encoding } = decodeInChunks([0x61, ...bytes, 0x62], 1);
        expect(encoding, `byte 0x${byte.toString(16)}`).toBe("windows-1252");
        const character = text.codePointAt(text.length - 2) as number;
        // Undefined bytes become the replacement character: text, not a hidden control.
        expect(character, `byte 0x${byte.toString(16)}`).toBe(expected ?? 0xfffd);
      }
    });
  });
});
