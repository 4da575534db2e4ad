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
