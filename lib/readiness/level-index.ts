/**
 * The levels of a category or text column found by their UTF-8 bytes: the hot path
 * (./column-scan.ts readBytes) counts a known level, or a value beyond the level table's cap,
 * without making a string for the field. Open addressing over an FNV-1a hash of the bytes;
 * a hit is confirmed byte by byte. Levels longer than INDEXED_LEVEL_BYTES are not indexed
 * (free text: its string is made, as before): a field that long is never looked up here.
 * Generic in what it keeps per value: the check keeps a level's accumulator, the fix tally
 * (./fixes/tally.ts) what its rules make of a value.
 */
import type { LevelAcc } from "./column-types";

export interface IndexedLevel<T = LevelAcc> {
  bytes: Uint8Array;
  text: string;
  value: T;
}

const encoder = new TextEncoder();

/** the longest level, in UTF-8 bytes, kept by its bytes */
export const INDEXED_LEVEL_BYTES = 256;

export class LevelIndex<T = LevelAcc> {
  private readonly levels: IndexedLevel<T>[] = [];
  private readonly hashes: number[] = [];
  /** slot → level number + 1 (0: empty), at most half full */
  private slots: Int32Array;

  constructor(expected = 16) {
    let cap = 32;
    while (cap < expected * 2) cap *= 2;
    this.slots = new Int32Array(cap);
  }

  get size(): number {
    return this.levels.length;
  }

  add(text: string, value: T): void {
    if (text.length > INDEXED_LEVEL_BYTES) return;
    const bytes = encoder.encode(text);
    if (bytes.length > INDEXED_LEVEL_BYTES) return;
    this.levels.push({ bytes, text, value });
    this.hashes.push(hashBytes(bytes, 0, bytes.length));
    if (this.levels.length * 2 > this.slots.length) this.grow();
    else this.place(this.levels.length - 1);
  }

  /** The level whose bytes are buf[a, b) (at most INDEXED_LEVEL_BYTES), if there is one. */
  find(buf: Uint8Array, a: number, b: number): IndexedLevel<T> | undefined {
    const h = hashBytes(buf, a, b);
    const mask = this.slots.length - 1;
    for (let i = h & mask; ; i = (i + 1) & mask) {
      const s = this.slots[i]!;
      if (s === 0) return undefined;
      if (this.hashes[s - 1] !== h) continue;
      const l = this.levels[s - 1]!;
      if (sameBytes(l.bytes, buf, a, b)) return l;
    }
  }

  private place(j: number): void {
    const mask = this.slots.length - 1;
    let i = this.hashes[j]! & mask;
    while (this.slots[i] !== 0) i = (i + 1) & mask;
    this.slots[i] = j + 1;
  }

  private grow(): void {
    this.slots = new Int32Array(this.slots.length * 2);
    for (let j = 0; j < this.levels.length; j++) this.place(j);
  }
}

/** Whether `bytes` equals buf[a, b). */
export function sameBytes(bytes: Uint8Array, buf: Uint8Array, a: number, b: number): boolean {
  const n = b - a;
  if (bytes.length !== n) return false;
  let k = 0;
  while (k < n && bytes[k] === buf[a + k]) k++;
  return k === n;
}

/** FNV-1a (32 bits) of buf[a, b). */
function hashBytes(buf: Uint8Array, a: number, b: number): number {
  let h = 0x811c9dc5;
  for (let i = a; i < b; i++) h = Math.imul(h ^ buf[i]!, 0x01000193);
  return h >>> 0;
}
