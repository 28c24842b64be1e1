/**
 * Small streaming accumulators with memory bounded independently of the row count.
 */

/** A count of rows with the first `cap` row numbers kept as evidence. */
export class RowSample {
  count = 0;
  rows: number[] = [];
  constructor(private cap: number) {}
  add(line: number): void {
    this.count++;
    if (this.rows.length < this.cap) this.rows.push(line);
  }
  /** Add a later part's sample (parts in file order). */
  absorb(o: { count: number; rows: number[] }): void {
    this.count += o.count;
    for (const r of o.rows) if (this.rows.length < this.cap) this.rows.push(r);
  }
}

/** Welford running moments; merge by Chan et al. (1979) pairwise update. */
export interface MomentsJSON {
  n: number;
  mean: number;
  m2: number;
  min: number;
  max: number;
}

export class Moments {
  n = 0;
  min = Infinity;
  max = -Infinity;
  /** shifted sums Σ(x − K), Σ(x − K)² with K the first value: no division per value, and no
   * cancellation as long as the mean is within a few SDs of K */
  private k = 0;
  private s1 = 0;
  private s2 = 0;
  add(x: number): void {
    if (this.n === 0) this.k = x;
    this.n++;
    const d = x - this.k;
    this.s1 += d;
    this.s2 += d * d;
    if (x < this.min) this.min = x;
    if (x > this.max) this.max = x;
  }
  get mean(): number {
    return this.n > 0 ? this.k + this.s1 / this.n : 0;
  }
  /** Σ(x − x̄)² */
  get m2(): number {
    return this.n > 0 ? Math.max(0, this.s2 - (this.s1 * this.s1) / this.n) : 0;
  }
  merge(o: MomentsJSON): void {
    if (o.n === 0) return;
    if (this.n === 0) {
      this.n = o.n;
      this.k = o.mean;
      this.s1 = 0;
      this.s2 = o.m2;
      this.min = o.min;
      this.max = o.max;
      return;
    }
    // Chan et al. (1979): pooled mean and sum of squares, then re-expressed around this K
    const n = this.n + o.n;
    const d = o.mean - this.mean;
    const m2 = this.m2 + o.m2 + (d * d * this.n * o.n) / n;
    const mean = this.mean + (d * o.n) / n;
    this.n = n;
    this.k = mean;
    this.s1 = 0;
    this.s2 = m2;
    this.min = Math.min(this.min, o.min);
    this.max = Math.max(this.max, o.max);
  }
  /** sample standard deviation (divisor n − 1) */
  get sd(): number {
    return this.n > 1 ? Math.sqrt(this.m2 / (this.n - 1)) : 0;
  }
  toJSON(): MomentsJSON {
    return { n: this.n, mean: this.mean, m2: this.m2, min: this.min, max: this.max };
  }
  static fromJSON(j: MomentsJSON): Moments {
    const m = new Moments();
    m.merge(j);
    return m;
  }
}

/** Deterministic 32-bit generator (mulberry32) so reports are reproducible. */
export function mulberry32(seed: number): () => number {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

/**
 * A row's sampling priority: MurmurHash3's 32-bit finaliser of its line number, a bijection on
 * 32-bit integers, so no two rows share one and the order looks random.
 */
export function linePriority(line: number): number {
  let h = line >>> 0;
  h = Math.imul(h ^ (h >>> 16), 0x85ebca6b);
  h = Math.imul(h ^ (h >>> 13), 0xc2b2ae35);
  return (h ^ (h >>> 16)) >>> 0;
}

/**
 * Values for quartiles. Exact while the column has at most `cap` values (all are kept, in file
 * order); beyond that a uniform sample of `cap` values without replacement: the values of the
 * `cap` rows with the smallest priority (linePriority; bottom-k sampling). Candidates below the
 * running threshold are appended to a buffer with a quarter of `cap` to spare; when it is full,
 * a selection on the priorities keeps the smallest `cap` and lowers the threshold. The kept set
 * depends only on which rows hold values, never on how the file was cut into parts, so parts
 * merge to exactly the sample of one pass. The quartiles of the sample have a standard error of
 * about 0.87·IQR/√cap.
 */
export class QuantileStore {
  private buf: Float64Array;
  private keys: Uint32Array;
  private len = 0;
  seen = 0;
  /** once the buffer has been cut to `cap`: a priority at or above this is never kept */
  private limit = Infinity;
  /** a copy of the kept values with some ranks in place (orderedAt), until a value is kept */
  private ordered: Float64Array | null = null;
  private readonly room: number;
  constructor(private cap: number) {
    this.room = cap + Math.max(64, cap >> 2);
    this.buf = new Float64Array(Math.min(this.room, 1024));
    this.keys = new Uint32Array(this.buf.length);
  }
  /** The value of the row on `line` (a spreadsheet's row number). */
  add(x: number, line: number): void {
    this.seen++;
    this.keep(x, linePriority(line));
  }
  private keep(x: number, key: number): void {
    if (key >= this.limit) return;
    this.ordered = null;
    if (this.len === this.buf.length) {
      if (this.len === this.room) {
        this.cut();
        if (key >= this.limit) return;
      } else {
        const n = Math.min(this.room, this.buf.length * 2);
        const b = new Float64Array(n);
        b.set(this.buf);
        this.buf = b;
        const k = new Uint32Array(n);
        k.set(this.keys);
        this.keys = k;
      }
    }
    this.buf[this.len] = x;
    this.keys[this.len++] = key;
  }
  /**
   * Keep the `cap` smallest priorities (priorities are distinct). The kept priorities are spread
   * evenly below the limit (a hash of the line), so the cap-th smallest lies close to
   * limit · cap / len: one pass puts every priority below a window around that guess first and
   * every one above it last, and the selection is left with the window (when the guess misses,
   * with everything). The selection is selectRanks' loop (below), written again because every
   * swap must move the value along with its priority.
   */
  private cut(): void {
    if (this.len <= this.cap) return;
    this.ordered = null;
    const { keys, buf } = this;
    const k = this.cap - 1;
    const top = this.limit === Infinity ? 2 ** 32 : this.limit;
    // five standard deviations of the cap-th of len evenly spread priorities, either side
    const guess = (top * this.cap) / this.len;
    const spread = (5 * top * Math.sqrt(this.cap)) / this.len;
    const below = guess - spread;
    const above = guess + spread;
    let a = 0;
    let m = 0;
    let b = this.len - 1;
    while (m <= b) {
      const key = keys[m]!;
      if (key < below) {
        if (a !== m) swapBoth(keys, buf, a, m);
        a++;
        m++;
      } else if (key >= above) {
        swapBoth(keys, buf, m, b);
        b--;
      } else m++;
    }
    let lo = a <= k && k <= b ? a : 0;
    let hi = a <= k && k <= b ? b : this.len - 1;
    while (hi > lo) {
      const pivot = keys[(lo + hi) >>> 1]!;
      let i = lo;
      let j = hi;
      while (i <= j) {
        while (keys[i]! < pivot) i++;
        while (keys[j]! > pivot) j--;
        if (i <= j) {
          swapBoth(keys, buf, i, j);
          i++;
          j--;
        }
      }
      if (k <= j) hi = j;
      else if (k >= i) lo = i;
      else break;
    }
    this.len = this.cap;
    // the selection leaves the cap-th smallest at k, above everything before it
    this.limit = keys[k]!;
  }
  get exact(): boolean {
    return this.seen <= this.cap;
  }
  /**
   * The kept values, their priorities and how many values they stand for (to merge parts of a
   * file). The part holds this store's own arrays, not copies: the store is not used after it
   * (a byte range's scan ends with its part).
   */
  part(): { values: Float64Array; keys: Uint32Array; seen: number } {
    this.cut();
    return { values: this.buf.subarray(0, this.len), keys: this.keys.subarray(0, this.len), seen: this.seen };
  }
  /**
   * Add a later part of the file: its kept values join in its order, so that while the union
   * fits the values stay in file order; beyond `cap` the union's smallest priorities are kept,
   * the same set one pass over both parts keeps. An empty store takes the first part's arrays
   * over, with the room behind them, rather than copying them.
   */
  absorb(o: { values: Float64Array; keys: Uint32Array; seen: number }): void {
    if (this.seen === 0 && this.len === 0 && o.values.length <= this.cap) {
      const room = (a: { buffer: ArrayBufferLike; byteOffset: number; BYTES_PER_ELEMENT: number }) =>
        Math.min(this.room, (a.buffer.byteLength - a.byteOffset) / a.BYTES_PER_ELEMENT);
      const n = Math.min(room(o.values), room(o.keys));
      this.buf = new Float64Array(o.values.buffer, o.values.byteOffset, n);
      this.keys = new Uint32Array(o.keys.buffer, o.keys.byteOffset, n);
      this.len = o.values.length;
      this.seen = o.seen;
      this.ordered = null;
      return;
    }
    for (let i = 0; i < o.values.length; i++) this.keep(o.values[i]!, o.keys[i]!);
    this.seen += o.seen;
  }
  /** Sorted copy of the kept values. */
  sorted(): Float64Array {
    this.cut();
    return this.buf.slice(0, this.len).sort();
  }
  /**
   * Quantiles (R type 7) of the kept values by selection, without a full sort. Works on a copy,
   * so the kept values keep their order (and their priorities).
   */
  quantiles(ps: number[]): number[] {
    const n = this.kept();
    if (n === 0) return ps.map(() => NaN);
    const at = ps.map((p) => (n - 1) * p);
    const ranks = new Set<number>();
    for (const h of at) ranks.add(Math.floor(h)).add(Math.min(n - 1, Math.floor(h) + 1));
    const a = this.orderedAt([...ranks]);
    return at.map((h) => {
      const lo = Math.floor(h);
      return h === lo ? a[lo]! : a[lo]! + (h - lo) * (a[Math.min(n - 1, lo + 1)]! - a[lo]!);
    });
  }
  /** A systematic sample of at most m kept values (for the pool state). */
  sample(m: number): number[] {
    const n = this.kept();
    // in file order while exact; beyond the cap the buffer's order depends on the parts, so by rank
    if (this.exact) {
      const kept = this.buf.subarray(0, n);
      if (n <= m) return Array.from(kept);
      return Array.from({ length: m }, (_, i) => kept[Math.floor(((i + 0.5) * n) / m)]!);
    }
    if (n <= m) return Array.from(this.sorted());
    const ranks = Array.from({ length: m }, (_, i) => Math.floor(((i + 0.5) * n) / m));
    const a = this.orderedAt(ranks);
    return ranks.map((r) => a[r]!);
  }
  /** How many values are kept (after cutting to the cap). */
  private kept(): number {
    this.cut();
    return this.len;
  }
  /** The kept values, copied once, with each of `ranks` (distinct, any order) in its sorted place. */
  private orderedAt(ranks: number[]): Float64Array {
    this.ordered ??= this.buf.slice(0, this.len);
    selectRanks(
      this.ordered,
      ranks.sort((x, y) => x - y),
    );
    return this.ordered;
  }
}

/** Rearrange a so that a[k] is its k-th smallest value; returns it. */
export function selectInPlace(a: Float64Array, k: number): number {
  selectRanks(a, [k]);
  return a[k]!;
}

/**
 * Rearrange a so that a[r] is its r-th smallest value (0-based) for every r of `ranks`
 * (ascending): Hoare's selection with a median-of-three pivot, going on only into the parts
 * that hold a wanted rank, so m ranks of n values cost about n·log₂(m) steps, not a sort's n·log₂(n).
 */
export function selectRanks(a: Float64Array, ranks: ArrayLike<number>): void {
  // parts still to order: [lo, hi, first rank, last rank] each
  const todo: number[] = [0, a.length - 1, 0, ranks.length - 1];
  while (todo.length > 0) {
    const rhi = todo.pop()!;
    const rlo = todo.pop()!;
    const hi = todo.pop()!;
    const lo = todo.pop()!;
    if (rlo > rhi || hi <= lo) continue;
    if (hi - lo < 16) {
      insertionSort(a, lo, hi);
      continue;
    }
    const mid = (lo + hi) >>> 1;
    if (a[mid]! < a[lo]!) swap(a, mid, lo);
    if (a[hi]! < a[lo]!) swap(a, hi, lo);
    if (a[hi]! < a[mid]!) swap(a, hi, mid);
    const pivot = a[mid]!;
    let i = lo;
    let j = hi;
    while (i <= j) {
      while (a[i]! < pivot) i++;
      while (a[j]! > pivot) j--;
      if (i <= j) {
        swap(a, i, j);
        i++;
        j--;
      }
    }
    // now a[lo..j] ≤ pivot ≤ a[i..hi], and what lies between equals the pivot (in place)
    let k = rlo;
    while (k <= rhi && ranks[k]! <= j) k++;
    let m = k;
    while (m <= rhi && ranks[m]! < i) m++;
    todo.push(lo, j, rlo, k - 1, i, hi, m, rhi);
  }
}

function insertionSort(a: Float64Array, lo: number, hi: number): void {
  for (let i = lo + 1; i <= hi; i++) {
    const v = a[i]!;
    let j = i - 1;
    while (j >= lo && a[j]! > v) {
      a[j + 1] = a[j]!;
      j--;
    }
    a[j + 1] = v;
  }
}

function swapBoth(keys: Uint32Array, values: Float64Array, i: number, j: number): void {
  const tk = keys[i]!;
  keys[i] = keys[j]!;
  keys[j] = tk;
  const tv = values[i]!;
  values[i] = values[j]!;
  values[j] = tv;
}

function swap(a: Float64Array, i: number, j: number): void {
  const t = a[i]!;
  a[i] = a[j]!;
  a[j] = t;
}

/** Quantile p (R type 7) of a, by selection; reorders a. */
export function selectQuantile(a: Float64Array, p: number): number {
  const n = a.length;
  if (n === 0) return NaN;
  const h = (n - 1) * p;
  const lo = Math.floor(h);
  if (h === lo || lo + 1 >= n) return selectInPlace(a, lo);
  selectRanks(a, [lo, lo + 1]);
  return a[lo]! + (h - lo) * (a[lo + 1]! - a[lo]!);
}

/** Quantile by R's default definition (type 7): linear interpolation between order statistics. */
export function quantile(sorted: ArrayLike<number>, p: number): number {
  const n = sorted.length;
  if (n === 0) return NaN;
  const h = (n - 1) * p;
  const lo = Math.floor(h);
  const hi = Math.min(n - 1, lo + 1);
  return sorted[lo]! + (h - lo) * (sorted[hi]! - sorted[lo]!);
}
