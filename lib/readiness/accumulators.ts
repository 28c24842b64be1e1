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
 * Values for quartiles. Exact while the column has at most `cap` values (all are kept);
 * beyond that a uniform reservoir sample of `cap` values (Vitter's algorithm R), whose
 * quartiles are an approximation with standard error about 0.87·IQR/√cap.
 */
export class QuantileStore {
  private buf: Float64Array;
  private len = 0;
  seen = 0;
  private rnd = mulberry32(0x5eed);
  /** Li's algorithm L: the index of the next value to enter the reservoir, and the running W */
  private nextIn = 0;
  private w = 1;
  constructor(private cap: number) {
    this.buf = new Float64Array(Math.min(cap, 1024));
  }
  add(x: number): void {
    this.seen++;
    if (this.len < this.cap) {
      if (this.len === this.buf.length) {
        const b = new Float64Array(Math.min(this.cap, this.buf.length * 2));
        b.set(this.buf);
        this.buf = b;
      }
      this.buf[this.len++] = x;
    } else {
      if (this.seen === this.cap + 1) this.skip();
      if (this.seen === this.nextIn) {
        this.buf[Math.floor(this.rnd() * this.cap)] = x;
        this.skip();
      }
    }
  }
  /** Algorithm L (Li 1994): geometric jumps between replacements, one draw per replacement. */
  private skip(): void {
    const k = this.cap;
    this.w *= Math.exp(Math.log(Math.max(this.rnd(), 1e-300)) / k);
    this.nextIn =
      (this.nextIn === 0 ? this.cap : this.nextIn) +
      Math.floor(Math.log(Math.max(this.rnd(), 1e-300)) / Math.log(1 - this.w)) +
      1;
  }
  get exact(): boolean {
    return this.seen <= this.cap;
  }
  /** The kept values and how many values they stand for (to merge parts of a file). */
  part(): { values: Float64Array; seen: number } {
    return { values: this.buf.slice(0, this.len), seen: this.seen };
  }
  /**
   * Add a later part: exact while the union fits, else a sample of `cap` values drawn from
   * each part in proportion to the values it stands for (each part's kept values being a
   * uniform sample of it, the result is a uniform sample of the union).
   */
  absorb(o: { values: Float64Array; seen: number }): void {
    const total = this.seen + o.seen;
    if (total <= this.cap) {
      for (const v of o.values) this.add(v);
      return;
    }
    const mine = Math.round((this.cap * this.seen) / total);
    const out = new Float64Array(this.cap);
    const pick = (src: Float64Array, m: number, at: number) => {
      for (let i = 0; i < m; i++) out[at + i] = src[Math.floor(((i + 0.5) * src.length) / m)]!;
    };
    pick(this.buf.subarray(0, this.len), Math.min(mine, this.len), 0);
    const taken = Math.min(mine, this.len);
    pick(o.values, Math.min(this.cap - taken, o.values.length), taken);
    this.len = taken + Math.min(this.cap - taken, o.values.length);
    this.buf = out;
    this.seen = total;
  }
  /** Sorted copy of the kept values. */
  sorted(): Float64Array {
    return this.buf.slice(0, this.len).sort();
  }
  /**
   * Quantiles (R type 7) of the kept values by selection, O(n) each, without a full sort.
   * Reorders the kept values (their order is not needed afterwards).
   */
  quantiles(ps: number[]): number[] {
    const a = this.buf.subarray(0, this.len);
    return ps.map((p) => selectQuantile(a, p));
  }
  /** A systematic sample of at most m kept values (for the pool state). */
  sample(m: number): number[] {
    if (this.len <= m) return Array.from(this.buf.subarray(0, this.len));
    const out: number[] = [];
    for (let i = 0; i < m; i++) out.push(this.buf[Math.floor(((i + 0.5) * this.len) / m)]!);
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
