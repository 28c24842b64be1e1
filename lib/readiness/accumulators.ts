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
   * Keep the `cap` smallest priorities (priorities are distinct). The loop is selectInPlace's
   * (below), written again because every swap must move the value along with its priority.
   */
  private cut(): void {
    if (this.len <= this.cap) return;
    const { keys, buf } = this;
    const k = this.cap - 1;
    let lo = 0;
    let hi = this.len - 1;
    while (hi > lo) {
      const pivot = keys[(lo + hi) >>> 1]!;
      let i = lo;
      let j = hi;
      while (i <= j) {
        while (keys[i]! < pivot) i++;
        while (keys[j]! > pivot) j--;
        if (i <= j) {
          const tk = keys[i]!;
          keys[i] = keys[j]!;
          keys[j] = tk;
          const tv = buf[i]!;
          buf[i] = buf[j]!;
          buf[j] = tv;
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
  /** The kept values, their priorities and how many values they stand for (to merge parts of a file). */
  part(): { values: Float64Array; keys: Uint32Array; seen: number } {
    this.cut();
    return { values: this.buf.slice(0, this.len), keys: this.keys.slice(0, this.len), seen: this.seen };
  }
  /**
   * Add a later part of the file: its kept values join in its order, so that while the union
   * fits the values stay in file order; beyond `cap` the union's smallest priorities are kept,
   * the same set one pass over both parts keeps.
   */
  absorb(o: { values: Float64Array; keys: Uint32Array; seen: number }): void {
    for (let i = 0; i < o.values.length; i++) this.keep(o.values[i]!, o.keys[i]!);
    this.seen += o.seen;
  }
  /** Sorted copy of the kept values. */
  sorted(): Float64Array {
    this.cut();
    return this.buf.slice(0, this.len).sort();
  }
  /**
   * Quantiles (R type 7) of the kept values by selection, O(n) each, without a full sort.
   * Works on a copy, so the kept values keep their order (and their priorities).
   */
  quantiles(ps: number[]): number[] {
    this.cut();
    const a = this.buf.slice(0, this.len);
    return ps.map((p) => selectQuantile(a, p));
  }
  /** A systematic sample of at most m kept values (for the pool state). */
  sample(m: number): number[] {
    this.cut();
    // in file order while exact; beyond the cap the buffer's order depends on the parts, so sorted
    const kept = this.exact ? this.buf.subarray(0, this.len) : this.sorted();
    if (this.len <= m) return Array.from(kept);
    const out: number[] = [];
    for (let i = 0; i < m; i++) out.push(kept[Math.floor(((i + 0.5) * this.len) / m)]!);
    return out;
  }
}

/** Rearrange a so that a[k] is its k-th smallest value (Hoare's selection, median-of-three pivot). */
export function selectInPlace(a: Float64Array, k: number): number {
  let lo = 0;
  let hi = a.length - 1;
  while (hi > lo) {
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
    if (k <= j) hi = j;
    else if (k >= i) lo = i;
    else break;
  }
  return a[k]!;
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
  const v = selectInPlace(a, lo);
  if (h === lo || lo + 1 >= n) return v;
  let next = Infinity;
  for (let i = lo + 1; i < n; i++) if (a[i]! < next) next = a[i]!;
  return v + (h - lo) * (next - v);
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
