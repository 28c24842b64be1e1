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

const EXPORT_FIX =
  "Open the file in your spreadsheet program and use File → Save As → CSV UTF-8 (comma delimited), then upload that file.";

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
    throw new UnreadableError(
      "This is an Excel workbook (or another zip archive), not a CSV file.",
      EXPORT_FIX,
      { kind: "zip" },
    );
  }
  if (startsWith(first, [0xd0, 0xcf, 0x11, 0xe0, 0xa1, 0xb1, 0x1a, 0xe1])) {
    throw new UnreadableError("This is an old-style Excel workbook (.xls), not a CSV file.", EXPORT_FIX, {
      kind: "ole2",
    });
  }
  if (startsWith(first, [0x1f, 0x8b])) {
    throw new UnreadableError(
      "This is a compressed (gzip) file, not a CSV file.",
      "Unpack the file and upload the CSV inside it.",
      { kind: "gzip" },
    );
  }
  if (startsWith(first, [0x25, 0x50, 0x44, 0x46])) {
    throw new UnreadableError(
      "This is a PDF document, not a CSV file.",
      "Export the data from its source program as CSV (UTF-8) and upload that.",
      { kind: "pdf" },
    );
  }
  if (startsWith(first, [0xff, 0xfe]) || startsWith(first, [0xfe, 0xff])) {
    throw new UnreadableError(
      "The file is UTF-16 text; the engine reads UTF-8.",
      "Save the file again choosing the encoding “UTF-8” (in Excel: Save As → CSV UTF-8).",
      { kind: "utf-16", bom: true },
    );
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
  if (
    n >= 4 &&
    (evenNul > n / 4 || oddNul > n / 4) &&
    Math.min(evenNul, oddNul) < Math.max(evenNul, oddNul) / 8
  ) {
    throw new UnreadableError(
      "The file looks like UTF-16 text (every other byte is zero); the engine reads UTF-8.",
      "Save the file again choosing the encoding “UTF-8” (in Excel: Save As → CSV UTF-8).",
      { kind: "utf-16", bom: false },
    );
  }
  return { bom: startsWith(first, [0xef, 0xbb, 0xbf]) ? 3 : 0 };
}

/** Refuse NUL and other control bytes that never occur in a text file. `offset` is the chunk's position in the file. */
export function checkBinary(chunk: Uint8Array, offset: number): void {
  const nul = chunk.indexOf(0);
  if (nul >= 0) {
    throw new UnreadableError(
      `The file holds binary content at byte ${offset + nul} (a NUL byte); it is not a text CSV file.`,
      EXPORT_FIX,
      { kind: "binary", byte: offset + nul },
    );
  }
}

/**
 * Where bytes stop being valid UTF-8 (RFC 3629): the offset of the first byte of the first
 * sequence that is malformed, overlong (`C0 80`, `E0 80 80`), a surrogate (`ED A0 80`) or
 * above U+10FFFF (`F4 90 80 80`); −1 when all is valid. A sequence cut off by the end of `b`
 * counts as invalid only when `complete`; otherwise `incompleteAt` receives where it starts.
 */
export function firstInvalidUtf8(
  b: Uint8Array,
  from = 0,
  complete = true,
  incompleteAt?: { at: number },
): number {
  let i = from;
  const n = b.length;
  while (i < n) {
    const c = b[i]!;
    if (c < 0x80) {
      i++;
      continue;
    }
    let need: number;
    let lo = 0x80;
    let hi = 0xbf;
    if (c >= 0xc2 && c <= 0xdf) need = 1;
    else if (c >= 0xe0 && c <= 0xef) {
      need = 2;
      if (c === 0xe0) lo = 0xa0;
      else if (c === 0xed) hi = 0x9f;
    } else if (c >= 0xf0 && c <= 0xf4) {
      need = 3;
      if (c === 0xf0) lo = 0x90;
      else if (c === 0xf4) hi = 0x8f;
    } else return i;
    for (let k = 1; k <= need; k++) {
      const x = b[i + k];
      if (x === undefined) {
        if (complete) return i;
        if (incompleteAt) incompleteAt.at = i;
        return -1;
      }
      if (k === 1 ? x < lo || x > hi : (x & 0xc0) !== 0x80) return i;
    }
    i += need + 1;
  }
  return -1;
}

const fatal = new TextDecoder("utf-8", { fatal: true });

/** Strict UTF-8 validation of a stream of chunks, with the file offset of the first bad byte. */
export class Utf8Check {
  private carry: Uint8Array = new Uint8Array(0);
  private carryOffset = 0;

  /** `isUtf8`: a fast whole-buffer validator (Node's buffer.isUtf8); the default decodes with a fatal decoder. */
  constructor(private isUtf8?: (b: Uint8Array) => boolean) {}

  /** Validate the next chunk, which starts at file offset `offset`. Throws UnreadableError. */
  check(chunk: Uint8Array, offset: number, last: boolean): void {
    let b = chunk;
    let start = offset;
    if (this.carry.length) {
      b = new Uint8Array(this.carry.length + chunk.length);
      b.set(this.carry);
      b.set(chunk, this.carry.length);
      start = this.carryOffset;
      this.carry = new Uint8Array(0);
    }
    let end = b.length;
    if (!last) {
      // an incomplete sequence at the end waits for the next chunk
      let i = b.length - 1;
      while (i >= 0 && b.length - i <= 3 && (b[i]! & 0xc0) === 0x80) i--;
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
    if (this.valid(part)) return;
    const at = firstInvalidUtf8(part);
    if (at < 0) return;
    const pos = start + at;
    const byte = part[at]!;
    const latin = byte >= 0xa0 ? String.fromCharCode(byte) : null;
    throw new UnreadableError(
      `The file is not valid UTF-8: byte ${pos} (0x${byte.toString(16).padStart(2, "0")}) cannot be decoded${latin ? `; it looks like Latin-1 or Windows-1252 text (that byte would be “${latin}”)` : ""}.`,
      "Save the file again choosing the encoding “UTF-8” (in Excel: Save As → CSV UTF-8; in LibreOffice: Character set → Unicode (UTF-8)).",
      { kind: "encoding", byte: pos },
    );
  }

  private valid(b: Uint8Array): boolean {
    if (this.isUtf8) return this.isUtf8(b);
    for (let i = 0; i < b.length; i++) if (b[i]! >= 0x80) return tryDecode(b);
    return true;
  }
}

function tryDecode(b: Uint8Array): boolean {
  try {
    fatal.decode(b);
    return true;
  } catch {
    return false;
  }
}
