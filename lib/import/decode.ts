import iconv from "iconv-lite";

/** How the file's bytes were read; "text" when the caller passed already-decoded text. */
export type TextEncodingName = "utf-8" | "utf-8-bom" | "windows-1252" | "utf-16le" | "utf-16be" | "text";

/**
 * Length of the longest prefix of `bytes` made of complete, valid UTF-8 sequences, or
 * -1 when an invalid byte appears. A sequence cut off at the end is not invalid: the
 * next chunk may complete it.
 */
export function validUtf8Prefix(bytes: Uint8Array): number {
  const length = bytes.length;
  let index = 0;
  while (index < length) {
    const lead = bytes[index];
    if (lead < 0x80) {
      index++;
      continue;
    }
    let size: number;
    let low = 0x80;
    let high = 0xbf;
    if (lead >= 0xc2 && lead <= 0xdf) size = 2;
    else if (lead >= 0xe0 && lead <= 0xef) {
      size = 3;
      if (lead === 0xe0) low = 0xa0;
      if (lead === 0xed) high = 0x9f;
    } else if (lead >= 0xf0 && lead <= 0xf4) {
      size = 4;
      if (lead === 0xf0) low = 0x90;
      if (lead === 0xf4) high = 0x8f;
    } else return -1;
    if (index + size > length) {
      for (let next = index + 1; next < length; next++) {
        const byte = bytes[next];
        if (byte < (next === index + 1 ? low : 0x80) || byte > (next === index + 1 ? high : 0xbf)) return -1;
      }
      return index;
    }
    for (let next = index + 1; next < index + size; next++) {
      const byte = bytes[next];
      if (byte < (next === index + 1 ? low : 0x80) || byte > (next === index + 1 ? high : 0xbf)) return -1;
    }
    index += size;
  }
  return length;
}

/** Where the decoder is between chunks: plain data, so the stage is one function. */
export interface DecoderState {
  encoding: TextEncodingName;
  /** Valid UTF-8 with accents came before bytes that were not UTF-8: the file mixes encodings. */
  mixed: boolean;
  started: boolean;
  /** Bytes of a character cut off at the end of the last chunk. */
  held: Uint8Array;
  sawMultiByte: boolean;
  utf16: TextDecoder | null;
}

export function createDecoder(): DecoderState {
  return { encoding: "utf-8", mixed: false, started: false, held: new Uint8Array(0), sawMultiByte: false, utf16: null };
}

const utf8 = new TextDecoder("utf-8");

// Node 20's TextDecoder("windows-1252") turns bytes 0x80–0x9F (’ “ ” – € …) into C1 control
// characters; iconv-lite follows the published Windows-1252 table. It is a single-byte
// encoding, so each chunk decodes on its own.
function windows1252(bytes: Uint8Array): string {
  return iconv.decode(Buffer.from(bytes.buffer, bytes.byteOffset, bytes.byteLength), "windows-1252");
}

/**
 * Stage 1, bytes to text, chunk by chunk. A byte-order mark decides the encoding; otherwise
 * the bytes are read as UTF-8 until one is not valid UTF-8, and from there on as
 * Windows-1252 (what spreadsheet programs on Windows write). Up to that point the text was
 * plain ASCII, which both encodings read alike, unless `mixed` is set.
 */
export function decodeBytes(state: DecoderState, chunk: Uint8Array, final: boolean): string {
  let bytes = chunk;
  if (state.held.length > 0) {
    bytes = new Uint8Array(state.held.length + chunk.length);
    bytes.set(state.held);
    bytes.set(chunk, state.held.length);
    state.held = new Uint8Array(0);
  }
  if (!state.started) {
    if (bytes.length < 3 && !final) {
      state.held = bytes.slice();
      return "";
    }
    state.started = true;
    if (bytes[0] === 0xef && bytes[1] === 0xbb && bytes[2] === 0xbf) {
      state.encoding = "utf-8-bom";
      bytes = bytes.subarray(3);
    } else if ((bytes[0] === 0xff && bytes[1] === 0xfe) || (bytes[0] === 0xfe && bytes[1] === 0xff)) {
      state.encoding = bytes[0] === 0xff ? "utf-16le" : "utf-16be";
      state.utf16 = new TextDecoder(state.encoding);
      bytes = bytes.subarray(2);
    }
  }
  if (state.utf16 !== null) return state.utf16.decode(bytes, { stream: !final });
  if (state.encoding === "windows-1252") return windows1252(bytes);
  const complete = validUtf8Prefix(bytes);
  if (complete === -1 || (final && complete < bytes.length)) {
    state.mixed = state.sawMultiByte || state.encoding === "utf-8-bom";
    state.encoding = "windows-1252";
    return windows1252(bytes);
  }
  if (!state.sawMultiByte) {
    for (let index = 0; index < complete; index++) {
      if (bytes[index] >= 0x80) {
        state.sawMultiByte = true;
        break;
      }
    }
  }
  if (complete < bytes.length) state.held = bytes.slice(complete);
  return utf8.decode(bytes.subarray(0, complete));
}
