/**
 * Byte-level checks before a file is read as text: what kind of file is this, and can it
 * be decoded as UTF-8? Every refusal carries a reason a provider can act on.
 */

/** A file the engine cannot read as CSV, with the reason in plain words. */
export class UnreadableError extends Error {
  constructor(
    message: string,
    readonly fix: string,
    readonly detail: Record<string, unknown> = {},
  ) {
    super(message);
    this.name = "UnreadableError";
  }
}

const EXPORT_FIX = "Open the file in your spreadsheet program and use File → Save As → CSV UTF-8 (comma delimited), then upload that file.";

function startsWith(b: Uint8Array, sig: number[]): boolean {
  if (b.length < sig.length) return false;
  return sig.every((v, i) => b[i] === v);
}

/**
 * Look at the first bytes of a file and refuse what is not a text file.
 * Returns the number of BOM bytes to skip (0 or 3).
 */
export function sniffBytes(first: Uint8Array): { bom: number } {
  if (startsWith(first, [0x50, 0x4b, 0x03, 0x04]) || startsWith(first, [0x50, 0x4b, 0x05, 0x06])) {
    throw new UnreadableError("This is an Excel workbook (or another zip archive), not a CSV file.", EXPORT_FIX, { kind: "zip" });
  }
  if (startsWith(first, [0xd0, 0xcf, 0x11, 0xe0, 0xa1, 0xb1, 0x1a, 0xe1])) {
    throw new UnreadableError("This is an old-style Excel workbook (.xls), not a CSV file.", EXPORT_FIX, { kind: "ole2" });
  }
  if (startsWith(first, [0x1f, 0x8b])) {
    throw new UnreadableError("This is a compressed (gzip) file, not a CSV file.", "Unpack the file and upload the CSV inside it.", { kind: "gzip" });
  }
  if (startsWith(first, [0x25, 0x50, 0x44, 0x46])) {
    throw new UnreadableError("This is a PDF document, not a CSV file.", "Export the data from its source program as CSV (UTF-8) and upload that.", { kind: "pdf" });
  }
  if (startsWith(first, [0xff, 0xfe]) || startsWith(first, [0xfe, 0xff])) {
    throw new UnreadableError("The file is UTF-16 text; the engine reads UTF-8.", "Save the file again choosing the encoding “UTF-8” (in Excel: Save As → CSV UTF-8).", { kind: "utf-16", bom: true });
  }
  const n = Math.min(first.length, 4096);
  let evenNul = 0;
  let oddNul = 0;
  for (let i = 0; i < n; i++) {
    if (first[i] === 0) {
      if (i % 2 === 0) evenNul++;
      else oddNul++;
    }
  }
  // UTF-16 without BOM: ASCII text leaves every other byte zero.
  if (n >= 4 && (evenNul > n / 4 || oddNul > n / 4) && Math.min(evenNul, oddNul) < Math.max(evenNul, oddNul) / 8) {
    throw new UnreadableError("The file looks like UTF-16 text (every other byte is zero); the engine reads UTF-8.", "Save the file again choosing the encoding “UTF-8” (in Excel: Save As → CSV UTF-8).", { kind: "utf-16", bom: false });
  }
  return { bom: startsWith(first, [0xef, 0xbb, 0xbf]) ? 3 : 0 };
}

/** Refuse NUL and other control bytes that never occur in a text file. `offset` is the chunk's position in the file. */
export function checkBinary(chunk: Uint8Array, offset: number): void {
  const nul = chunk.indexOf(0);
  if (nul >= 0) {
    throw new UnreadableError(`The file holds binary content at byte ${offset + nul} (a NUL byte); it is not a text CSV file.`, EXPORT_FIX, { kind: "binary", byte: offset + nul });
  }
}

/**
 * Find where a chunk stops being valid UTF-8 (the first offending byte), or -1.
 * Used only to explain a decoding failure, so speed does not matter.
 */
export function firstInvalidUtf8(b: Uint8Array): number {
  let i = 0;
  while (i < b.length) {
    const c = b[i]!;
    if (c < 0x80) {
      i++;
      continue;
    }
    let need = 0;
    if (c >= 0xc2 && c <= 0xdf) need = 1;
    else if (c >= 0xe0 && c <= 0xef) need = 2;
    else if (c >= 0xf0 && c <= 0xf4) need = 3;
    else return i;
    for (let k = 1; k <= need; k++) {
      const d = b[i + k];
      if (d === undefined) return -1;
      if ((d & 0xc0) !== 0x80) return i;
    }
    i += need + 1;
  }
  return -1;
}

/**
 * Streaming UTF-8 decoder that turns a decoding failure into a provider-facing reason.
 * Decodes with the (fast) replacing decoder on whole sequences; only when a replacement
 * character appears is the chunk validated byte by byte (a file may hold U+FFFD legitimately).
 */
export class Utf8Stream {
  private decoder = new TextDecoder("utf-8", { ignoreBOM: false });
  private carry: Uint8Array | null = null;
  private carryOffset = 0;

  /** `fastAscii`: an optional faster decoder for pure-ASCII chunks (returns null otherwise). */
  constructor(private fastAscii?: (b: Uint8Array) => string | null) {}

  decode(chunk: Uint8Array, offset: number, last: boolean): string {
    let b = chunk;
    let start = offset;
    if (this.carry) {
      b = new Uint8Array(this.carry.length + chunk.length);
      b.set(this.carry);
      b.set(chunk, this.carry.length);
      start = this.carryOffset;
      this.carry = null;
    }
    let end = b.length;
    if (!last) {
      // keep an incomplete trailing sequence for the next chunk
      let i = b.length - 1;
      let back = 0;
      while (i >= 0 && back < 3 && (b[i]! & 0xc0) === 0x80) {
        i--;
        back++;
      }
      if (i >= 0 && b[i]! >= 0xc0) {
        const need = b[i]! >= 0xf0 ? 4 : b[i]! >= 0xe0 ? 3 : 2;
        if (b.length - i < need) end = i;
      }
      if (end < b.length) {
        this.carry = b.slice(end);
        this.carryOffset = start + end;
      }
    }
    const part = end === b.length ? b : b.subarray(0, end);
    const text = this.fastAscii?.(part) ?? this.decoder.decode(part);
    if (text.indexOf("\uFFFD") >= 0) {
      const at = firstInvalidUtf8(part);
      if (at >= 0 || (last && truncatedTail(part))) {
        const pos = start + (at >= 0 ? at : part.length - 1);
        const byte = at >= 0 ? part[at]! : part[part.length - 1]!;
        const latin = byte >= 0xa0 ? String.fromCharCode(byte) : null;
        throw new UnreadableError(
          `The file is not valid UTF-8: byte ${pos} (0x${byte.toString(16).padStart(2, "0")}) cannot be decoded${latin ? `; it looks like Latin-1 or Windows-1252 text (that byte would be “${latin}”)` : ""}.`,
          "Save the file again choosing the encoding “UTF-8” (in Excel: Save As → CSV UTF-8; in LibreOffice: Character set → Unicode (UTF-8)).",
          { kind: "encoding", byte: pos },
        );
      }
    }
    return text;
  }
}

function truncatedTail(b: Uint8Array): boolean {
  let i = b.length - 1;
  while (i >= 0 && b.length - i <= 4 && (b[i]! & 0xc0) === 0x80) i--;
  if (i < 0 || b[i]! < 0xc0) return false;
  const need = b[i]! >= 0xf0 ? 4 : b[i]! >= 0xe0 ? 3 : 2;
  return b.length - i < need;
}
