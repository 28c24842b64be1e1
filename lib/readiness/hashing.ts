/**
 * Row and key hashing for duplicate detection: two 32-bit string hashes per row, kept in an
 * open-addressing table with the line of each first occurrence.
 */

/**
 * A set of 64-bit hashes in open addressing, for duplicate rows and keys: 12 bytes per slot
 * (two 32-bit hash halves and the first row's line), kept at most 60 % full (linear probing
 * stays short there, and a smaller table means fewer fresh memory pages to fault in), so 20–40
 * bytes per distinct row; it stops growing at `maxEntries` and then says so.
 */
export class HashSet64 {
  private hi: Uint32Array;
  private lo: Uint32Array;
  private line: Uint32Array;
  size = 0;
  full = false;
  constructor(private maxEntries: number) {
    this.hi = new Uint32Array(1024);
    this.lo = new Uint32Array(1024);
    this.line = new Uint32Array(1024);
  }
  /** Make room for about n entries at once (avoids rehashing while a large file is read). */
  reserve(n: number): void {
    const want = Math.ceil((Math.min(this.maxEntries, Math.max(0, Math.floor(n))) * 5) / 3);
    let cap = this.hi.length;
    while (cap < want) cap *= 2;
    if (cap > this.hi.length) this.grow(cap);
  }

  /** Insert; returns the line of an earlier equal entry, 0 when new (or when the set is full). */
  addOrGet(h1: number, h2: number, line: number): number {
    if (h1 === 0 && h2 === 0) h2 = 1;
    const mask = this.hi.length - 1;
    let i = (h1 ^ Math.imul(h2, 0x9e3779b1)) & mask;
    for (;;) {
      const a = this.hi[i]!;
      const b = this.lo[i]!;
      if (a === 0 && b === 0) break;
      if (a === h1 >>> 0 && b === h2 >>> 0) return this.line[i]!;
      i = (i + 1) & mask;
    }
    if (this.size >= this.maxEntries) {
      this.full = true;
      return 0;
    }
    this.hi[i] = h1;
    this.lo[i] = h2;
    this.line[i] = line;
    this.size++;
    if (this.size * 5 > this.hi.length * 3) this.grow();
    return 0;
  }
  private grow(to?: number): void {
    const { hi, lo, line } = this;
    const cap = to ?? hi.length * 2;
    this.hi = new Uint32Array(cap);
    this.lo = new Uint32Array(cap);
    this.line = new Uint32Array(cap);
    const mask = cap - 1;
    for (let k = 0; k < hi.length; k++) {
      const a = hi[k]!;
      const b = lo[k]!;
      if (a === 0 && b === 0) continue;
      let i = (a ^ Math.imul(b, 0x9e3779b1)) & mask;
      while (this.hi[i] !== 0 || this.lo[i] !== 0) i = (i + 1) & mask;
      this.hi[i] = a;
      this.lo[i] = b;
      this.line[i] = line[k]!;
    }
  }
  get bytes(): number {
    return this.hi.length * 12;
  }
  raw(): { hi: Uint32Array; lo: Uint32Array; line: Uint32Array; size: number; full: boolean } {
    return { hi: this.hi, lo: this.lo, line: this.line, size: this.size, full: this.full };
  }
  static fromRaw(
    r: { hi: Uint32Array; lo: Uint32Array; line: Uint32Array; size: number; full: boolean },
    maxEntries: number,
  ): HashSet64 {
    const h = new HashSet64(maxEntries);
    h.hi = r.hi;
    h.lo = r.lo;
    h.line = r.line;
    h.size = r.size;
    h.full = r.full;
    return h;
  }
  /** Visit the stored entries (hash halves and first line). */
  forEach(f: (h1: number, h2: number, line: number) => void): void {
    for (let i = 0; i < this.hi.length; i++)
      if (this.hi[i] !== 0 || this.lo[i] !== 0) f(this.hi[i]!, this.lo[i]!, this.line[i]!);
  }
}

/** Two 32-bit hash halves: the output of hashFields / hashByteFields (one per reader, reused per row). */
export class Hash64 {
  a = 0;
  b = 0;
}

/** Two independent 32-bit string hashes (FNV-1a and a multiplicative one) of fields[from, to), into `out`. */
export function hashFields(out: Hash64, fields: string[], from = 0, to = fields.length): void {
  let a = 0x811c9dc5;
  let b = 0x12345678;
  for (let j = from; j < to; j++) {
    const s = fields[j]!;
    for (let i = 0; i < s.length; i++) {
      const c = s.charCodeAt(i);
      a = Math.imul(a ^ c, 0x01000193);
      b = Math.imul(b + c, 0x5bd1e995) ^ (b >>> 13);
    }
    a = Math.imul(a ^ 0x1f, 0x01000193);
    b = Math.imul(b + 0x1f, 0x5bd1e995) ^ (b >>> 13);
  }
  out.a = a >>> 0;
  out.b = b >>> 0;
}

/**
 * hashFields over the UTF-8 bytes of the fields from … to − 1 of a block (the same two hashes
 * as hashFields for ASCII text).
 */
export function hashByteFields(
  out: Hash64,
  buf: Uint8Array,
  starts: Int32Array,
  ends: Int32Array,
  from: number,
  to: number,
): void {
  let h1 = 0x811c9dc5;
  let h2 = 0x12345678;
  for (let f = from; f < to; f++) {
    const e = ends[f]!;
    for (let i = starts[f]!; i < e; i++) {
      const c = buf[i]!;
      h1 = Math.imul(h1 ^ c, 0x01000193);
      h2 = Math.imul(h2 + c, 0x5bd1e995) ^ (h2 >>> 13);
    }
    h1 = Math.imul(h1 ^ 0x1f, 0x01000193);
    h2 = Math.imul(h2 + 0x1f, 0x5bd1e995) ^ (h2 >>> 13);
  }
  out.a = h1 >>> 0;
  out.b = h2 >>> 0;
}
