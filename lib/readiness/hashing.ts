/**
 * Row and key hashing for duplicate detection: two 32-bit string hashes per row, kept in an
 * open-addressing table with the line of each first occurrence.
 */

/**
 * A set of 64-bit hashes in open addressing, for duplicate rows and keys: 12 bytes per slot
 * (two 32-bit hash halves and the first row's line, side by side in one table, so a probe
 * touches one cache line rather than three), kept at most 60 % full (linear probing stays
 * short there, and a smaller table means fewer fresh memory pages to fault in), so 20–40
 * bytes per distinct row; it stops growing at `maxEntries` and then says so. The table has any
 * number of slots (a hash picks its first slot by multiplying, not by masking bits), so a table
 * sized for the rows expected is not rounded up to a power of two (up to twice the memory).
 */
export class HashSet64 {
  /** slot i: slots[3i] and slots[3i + 1] the hash halves (both 0: empty), slots[3i + 2] the line */
  private slots: Uint32Array<ArrayBuffer>;
  private cap = 1024;
  size = 0;
  full = false;
  /** the sets of later parts of the file (a merge), looked up after this one's own entries */
  private later: HashSet64[] = [];
  /** entries of the later sets already in an earlier one */
  private laterRepeats = 0;
  constructor(private maxEntries: number) {
    this.slots = new Uint32Array(3 * this.cap);
  }
  /** Make room for about n entries at once (avoids rehashing while a large file is read). */
  reserve(n: number): void {
    const want = Math.ceil((Math.min(this.maxEntries, Math.max(0, Math.floor(n))) * 5) / 3);
    if (want > this.cap) this.grow(want);
  }

  /** Insert; returns the line of an earlier equal entry, 0 when new (or when the set is full). */
  addOrGet(h1: number, h2: number, line: number): number {
    if (h1 === 0 && h2 === 0) h2 = 1;
    const a1 = h1 >>> 0;
    const a2 = h2 >>> 0;
    const t = this.slots;
    const cap = this.cap;
    let i = firstSlot(a1, a2, cap);
    for (;;) {
      const at = 3 * i;
      const a = t[at]!;
      const b = t[at + 1]!;
      if (a === 0 && b === 0) break;
      if (a === a1 && b === a2) return t[at + 2]!;
      if (++i === cap) i = 0;
    }
    for (let k = 0; k < this.later.length; k++) {
      const l = this.later[k]!.ownLineOf(a1, a2);
      if (l) return l;
    }
    if (this.entries >= this.maxEntries) {
      this.full = true;
      return 0;
    }
    t[3 * i] = a1;
    t[3 * i + 1] = a2;
    t[3 * i + 2] = line;
    this.size++;
    if (this.size * 5 > this.cap * 3) this.grow();
    return 0;
  }
  /** The line stored with an entry (its first occurrence), 0 when it is not in the set. */
  lineOf(h1: number, h2: number): number {
    if (h1 === 0 && h2 === 0) h2 = 1;
    const own = this.ownLineOf(h1 >>> 0, h2 >>> 0);
    if (own) return own;
    for (let k = 0; k < this.later.length; k++) {
      const l = this.later[k]!.ownLineOf(h1 >>> 0, h2 >>> 0);
      if (l) return l;
    }
    return 0;
  }
  private ownLineOf(a1: number, a2: number): number {
    const t = this.slots;
    const cap = this.cap;
    for (let i = firstSlot(a1, a2, cap); ;) {
      const a = t[3 * i]!;
      const b = t[3 * i + 1]!;
      if (a === 0 && b === 0) return 0;
      if (a === a1 && b === a2) return t[3 * i + 2]!;
      if (++i === cap) i = 0;
    }
  }
  /** Distinct entries, here and in the later parts' sets. */
  get entries(): number {
    let n = this.size - this.laterRepeats;
    for (const s of this.later) n += s.size;
    return n;
  }
  /**
   * Take the set of a later part of the file as it is, to be looked up after this one (no
   * entries copied, no table grown: a merge of byte ranges keeps each range's table);
   * `repeats` of its entries are in this set already.
   */
  chain(later: HashSet64, repeats: number): void {
    this.later.push(later);
    this.laterRepeats += repeats;
  }
  private grow(to?: number): void {
    const old = this.slots;
    const oldCap = this.cap;
    const cap = to ?? oldCap * 2;
    const t = new Uint32Array(3 * cap);
    for (let k = 0; k < oldCap; k++) {
      const a = old[3 * k]!;
      const b = old[3 * k + 1]!;
      if (a === 0 && b === 0) continue;
      let i = firstSlot(a, b, cap);
      while (t[3 * i] !== 0 || t[3 * i + 1] !== 0) if (++i === cap) i = 0;
      t[3 * i] = a;
      t[3 * i + 1] = b;
      t[3 * i + 2] = old[3 * k + 2]!;
    }
    this.slots = t;
    this.cap = cap;
  }
  get bytes(): number {
    return this.slots.byteLength;
  }
  raw(): { slots: Uint32Array<ArrayBuffer>; size: number; full: boolean } {
    return { slots: this.slots, size: this.size, full: this.full };
  }
  static fromRaw(
    r: { slots: Uint32Array<ArrayBuffer>; size: number; full: boolean },
    maxEntries: number,
  ): HashSet64 {
    const h = new HashSet64(maxEntries);
    h.slots = r.slots;
    h.cap = r.slots.length / 3;
    h.size = r.size;
    h.full = r.full;
    return h;
  }
  /** Visit the stored entries (hash halves and first line). */
  forEach(f: (h1: number, h2: number, line: number) => void): void {
    const t = this.slots;
    for (let at = 0; at < t.length; at += 3)
      if (t[at] !== 0 || t[at + 1] !== 0) f(t[at]!, t[at + 1]!, t[at + 2]!);
  }
}

/** The slot where the probe for (a, b) starts, in 0 … cap − 1: the mixed hash scaled to cap. */
function firstSlot(a: number, b: number, cap: number): number {
  return Math.floor(((a ^ Math.imul(b, 0x9e3779b1)) >>> 0) * cap * 2 ** -32);
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
 * as hashFields for ASCII text). A deliberate copy of hashFields' loop: the hot path hashes the
 * bytes where they lie, without making a string per field.
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
