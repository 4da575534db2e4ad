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

/**
 * Turns the file's bytes into text chunk by chunk. A byte-order mark decides the
 * encoding; otherwise the bytes are read as UTF-8 until one is not valid UTF-8, and
 * from there on as Windows-1252 (what spreadsheet programs on Windows write). Up to that
 * point the text was plain ASCII, which both encodings read alike, unless `mixed` is set.
 */
export class ByteDecoder {
  encoding: TextEncodingName = "utf-8";
  /** Valid UTF-8 with accents came before bytes that were not UTF-8: the file mixes encodings. */
  mixed = false;
  private started = false;
  private held: Uint8Array = new Uint8Array(0);
  private sawMultiByte = false;
  private readonly utf8 = new TextDecoder("utf-8");
  private readonly windows1252 = new TextDecoder("windows-1252");
  private utf16: TextDecoder | null = null;

  decode(chunk: Uint8Array, final: boolean): string {
    let bytes = chunk;
    if (this.held.length > 0) {
      bytes = new Uint8Array(this.held.length + chunk.length);
      bytes.set(this.held);
      bytes.set(chunk, this.held.length);
      this.held = new Uint8Array(0);
    }
    if (!this.started) {
      if (bytes.length < 3 && !final) {
        this.held = bytes.slice();
        return "";
      }
      this.started = true;
      if (bytes[0] === 0xef && bytes[1] === 0xbb && bytes[2] === 0xbf) {
        this.encoding = "utf-8-bom";
        bytes = bytes.subarray(3);
      } else if ((bytes[0] === 0xff && bytes[1] === 0xfe) || (bytes[0] === 0xfe && bytes[1] === 0xff)) {
        this.encoding = bytes[0] === 0xff ? "utf-16le" : "utf-16be";
        this.utf16 = new TextDecoder(this.encoding);
        bytes = bytes.subarray(2);
      }
    }
    if (this.utf16 !== null) return this.utf16.decode(bytes, { stream: !final });
    if (this.encoding === "windows-1252") return this.windows1252.decode(bytes);
    const complete = validUtf8Prefix(bytes);
    if (complete === -1 || (final && complete < bytes.length)) {
      this.mixed = this.sawMultiByte || this.encoding === "utf-8-bom";
      this.encoding = "windows-1252";
      return this.windows1252.decode(bytes);
    }
    if (!this.sawMultiByte) {
      for (let index = 0; index < complete; index++) {
        if (bytes[index] >= 0x80) {
          this.sawMultiByte = true;
          break;
        }
      }
    }
    if (complete < bytes.length) this.held = bytes.slice(complete);
    return this.utf8.decode(bytes.subarray(0, complete));
  }
}
