/**
 * Streaming least squares by square-root-free Givens rotations: Miller (1992), "Algorithm
 * AS 274: Least squares routines to supplement those of Gentleman", Applied Statistics 41,
 * 458–478 (the `includ` routine). The state is the triangular factor of the augmented
 * matrix [X | y] in the form Rbar (unit upper triangular, row-packed), D (row weights),
 * θ (Rbarᵀ-transformed y) and the residual sum of squares:
 *   [X | y]ᵀ[X | y] = [Rbar θ; 0 1]ᵀ diag(D, sserr) [Rbar θ; 0 1].
 * Memory is O(k²) whatever the number of rows (plus a bounded copy of the first rows, kept only
 * while a batch is small, for refining the coefficients: refine.ts); XᵀX is never formed.
 *
 * Rows arrive one at a time but are rotated in four at once (`includeFour`): each element of
 * the factor is loaded once for four rows instead of once per row. The arithmetic is the
 * sequential routine's, operation for operation and in the same order, so the factor is the
 * same to the last bit however the rows are grouped (and so whatever the thread count).
 */
import { z } from "zod";
import { joinKept, keepRow, remapKept } from "./refine";

export interface LeastSquaresJSON {
  kind: "least-squares";
  version: 1;
  k: number;
  n: number;
  d: number[];
  rbar: number[];
  thetab: number[];
  sserr: number;
  /** the rows themselves ([x…, y] each) while they are few, for refining the coefficients (refine.ts) */
  rows?: number[];
}

/** Rows rotated into the factor in one pass (see `includeFour`). */
const ROWS_AT_ONCE = 4;

const finite = z.number().refine(Number.isFinite, "must be a finite number");
const jsonSchema = z.object({
  kind: z.literal("least-squares"),
  version: z.literal(1),
  k: z.number().int().min(1),
  n: z.number().int().min(0),
  d: z.array(finite),
  rbar: z.array(finite),
  thetab: z.array(finite),
  sserr: finite,
  rows: z.array(finite).optional(),
});

export class LeastSquares {
  readonly k: number;
  private rows = 0;
  private readonly d: Float64Array;
  private readonly rbar: Float64Array;
  private readonly thetab: Float64Array;
  private sserr = 0;
  private readonly work: Float64Array;
  private kept: number[] | null = [];
  /** Rows added but not yet rotated in: ROWS_AT_ONCE slots of [x…, y]. */
  private readonly pending: Float64Array;
  private pendingRows = 0;

  constructor(k: number) {
    if (!Number.isInteger(k) || k < 1)
      throw new RangeError(`LeastSquares needs at least one design column (got k = ${k})`);
    this.k = k;
    this.d = new Float64Array(k);
    this.rbar = new Float64Array((k * (k - 1)) / 2);
    this.thetab = new Float64Array(k);
    this.work = new Float64Array(k + 1);
    this.pending = new Float64Array(ROWS_AT_ONCE * (k + 1));
  }

  /** Number of rows included. */
  get n(): number {
    return this.rows;
  }

  /** Add one complete case (x has k entries, the intercept's 1 included by the caller). */
  addRow(x: ArrayLike<number>, y: number): void {
    const k = this.k;
    if (x.length !== k) throw new RangeError(`row has ${x.length} design values, expected ${k}`);
    const slot = this.pendingRows * (k + 1);
    const p = this.pending;
    for (let i = 0; i < k; i++) {
      const v = x[i] as number;
      if (v - v !== 0) throw new RangeError(`design value ${v} in position ${i + 1} is not a finite number`);
      p[slot + i] = v;
    }
    if (y - y !== 0) throw new RangeError(`response value ${y} is not a finite number`);
    p[slot + k] = y;
    this.kept = keepRow(this.kept, x, y);
    this.rows++;
    if (++this.pendingRows === ROWS_AT_ONCE) {
      this.includeFour();
      this.pendingRows = 0;
    }
  }

  /** Rotate in the rows still waiting for a group of four, one by one. Every reader of the factor calls this first. */
  private settle(): void {
    const k = this.k;
    for (let r = 0; r < this.pendingRows; r++)
      this.include(1, this.pending.subarray(r * (k + 1), (r + 1) * (k + 1)));
    this.pendingRows = 0;
  }

  /**
   * `include` for the four pending rows (weight 1 each) in one pass over the factor. Column i
   * sees the rows in order, each after the rotations of the rows before it, exactly as four
   * calls of `include` would; where a row has a zero (or has run out of weight) at column i,
   * that column goes row by row as in `include`, which skips the zero.
   */
  private includeFour(): void {
    const k = this.k;
    const d = this.d;
    const rbar = this.rbar;
    const thetab = this.thetab;
    const p = this.pending;
    const o1 = k + 1;
    const o2 = 2 * o1;
    const o3 = 3 * o1;
    let w0 = 1;
    let w1 = 1;
    let w2 = 1;
    let w3 = 1;
    let pos = 0; // rbar[i][i+1], row-packed
    for (let i = 0; i < k; i++) {
      const x0 = p[i] as number;
      const x1 = p[o1 + i] as number;
      const x2 = p[o2 + i] as number;
      const x3 = p[o3 + i] as number;
      if (x0 === 0 || x1 === 0 || x2 === 0 || x3 === 0 || w0 === 0 || w1 === 0 || w2 === 0 || w3 === 0) {
        w0 = this.rotateColumn(p, i, pos, w0);
        w1 = this.rotateColumn(p, i, pos, w1, o1);
        w2 = this.rotateColumn(p, i, pos, w2, o2);
        w3 = this.rotateColumn(p, i, pos, w3, o3);
        pos += k - i - 1;
        continue;
      }
      let di = d[i] as number;
      let dp = di + w0 * x0 * x0;
      const c0 = di / dp;
      const s0 = (w0 * x0) / dp;
      w0 = c0 * w0;
      di = dp;
      dp = di + w1 * x1 * x1;
      const c1 = di / dp;
      const s1 = (w1 * x1) / dp;
      w1 = c1 * w1;
      di = dp;
      dp = di + w2 * x2 * x2;
      const c2 = di / dp;
      const s2 = (w2 * x2) / dp;
      w2 = c2 * w2;
      di = dp;
      dp = di + w3 * x3 * x3;
      const c3 = di / dp;
      const s3 = (w3 * x3) / dp;
      w3 = c3 * w3;
      d[i] = dp;
      // The design columns after i (factor entries rbar[i][j]), then y at slot k (entry θ[i]).
      for (let j = i + 1; j <= k; j++) {
        let r = (j < k ? rbar[pos] : thetab[i]) as number;
        const v0 = p[j] as number;
        p[j] = v0 - x0 * r;
        r = c0 * r + s0 * v0;
        const v1 = p[o1 + j] as number;
        p[o1 + j] = v1 - x1 * r;
        r = c1 * r + s1 * v1;
        const v2 = p[o2 + j] as number;
        p[o2 + j] = v2 - x2 * r;
        r = c2 * r + s2 * v2;
        const v3 = p[o3 + j] as number;
        p[o3 + j] = v3 - x3 * r;
        r = c3 * r + s3 * v3;
        if (j < k) rbar[pos++] = r;
        else thetab[i] = r;
      }
    }
    this.addResidual(w0, p[k] as number);
    this.addResidual(w1, p[o1 + k] as number);
    this.addResidual(w2, p[o2 + k] as number);
    this.addResidual(w3, p[o3 + k] as number);
  }

  /** A rotated row's share of the residual sum of squares (none once its weight is spent, as in `include`). */
  private addResidual(w: number, y: number): void {
    if (w !== 0) this.sserr += w * y * y;
  }

  /**
   * One column of `include`: rotates the row at `row[slot…]` (x, then y at slot + k) into row i
   * of the factor, whose rbar entries start at `rowStart`; returns the row's new weight. A zero
   * x[i] (or a spent weight) leaves both as they are.
   */
  private rotateColumn(row: Float64Array, i: number, rowStart: number, w: number, slot = 0): number {
    const k = this.k;
    const xi = row[slot + i] as number;
    if (w === 0 || xi === 0) return w;
    const di = this.d[i] as number;
    const dpi = di + w * xi * xi;
    const cbar = di / dpi;
    const sbar = (w * xi) / dpi;
    this.d[i] = dpi;
    let pos = rowStart;
    for (let j = i + 1; j <= k; j++) {
      const xk = row[slot + j] as number;
      const r = (j < k ? this.rbar[pos] : this.thetab[i]) as number;
      row[slot + j] = xk - xi * r;
      if (j < k) this.rbar[pos++] = cbar * r + sbar * xk;
      else this.thetab[i] = cbar * r + sbar * xk;
    }
    return cbar * w;
  }

  /**
   * AS 274 `includ`: rotate the weighted row (w, x, y) into the factor; `row` holds x in
   * slots 0…k−1 and y in slot k, and is overwritten.
   */
  private include(weight: number, row: Float64Array): void {
    let w = weight;
    let pos = 0;
    for (let i = 0; i < this.k && w !== 0; i++) {
      w = this.rotateColumn(row, i, pos, w);
      pos += this.k - i - 1;
    }
    this.addResidual(w, row[this.k] as number);
  }

  /** Feed every row of another factor (weights D) into this one: the factor of the union of rows. */
  private absorb(other: LeastSquares, position: (j: number) => number): void {
    this.settle();
    other.settle();
    const ko = other.k;
    const w = this.work;
    let pos = 0;
    for (let i = 0; i < ko; i++) {
      const di = other.d[i] as number;
      if (di === 0) {
        pos += ko - i - 1;
        continue;
      }
      w.fill(0);
      w[position(i)] = 1;
      for (let j = i + 1; j < ko; j++) w[position(j)] = other.rbar[pos++] as number;
      w[this.k] = other.thetab[i] as number;
      this.include(di, w);
    }
    this.sserr += other.sserr;
  }

  /** Union of two row sets (same design columns): stack the two factors and re-triangularise. */
  merge(other: LeastSquares): void {
    if (other.k !== this.k) {
      throw new RangeError(
        `cannot merge least-squares states with ${this.k} and ${other.k} design columns; expand them to one column list first`,
      );
    }
    const src = other === this ? other.clone() : other;
    this.absorb(src, (j) => j);
    this.rows += src.rows;
    this.kept = joinKept(this.kept, src.kept);
  }

  /**
   * The same rows with the design columns renamed/reordered to `to`; a name absent from `from`
   * becomes a column of zeros (e.g. an indicator for a level this batch does not have).
   * Names of `from` that are absent from `to` are dropped (their rows stay).
   */
  expandColumns(from: string[], to: string[]): LeastSquares {
    if (from.length !== this.k)
      throw new RangeError(`expandColumns: 'from' lists ${from.length} names for ${this.k} design columns`);
    const index = new Map<string, number>();
    to.forEach((name, i) => {
      if (index.has(name)) throw new RangeError(`expandColumns: column "${name}" appears twice in 'to'`);
      index.set(name, i);
    });
    if (new Set(from).size !== from.length)
      throw new RangeError("expandColumns: 'from' repeats a column name");
    this.settle();
    const out = new LeastSquares(to.length);
    const targets = from.map((name) => index.get(name) ?? -1);
    if (targets.every((t) => t >= 0)) {
      out.absorb(this, (j) => targets[j] as number);
    } else {
      // Dropping columns: go through the explicit augmented factor rows.
      const K = this.k + 1;
      const r = this.augmentedFactor();
      const w = new Float64Array(to.length + 1);
      for (let i = 0; i < K; i++) {
        w.fill(0);
        for (let j = 0; j < this.k; j++) {
          const t = targets[j] as number;
          if (t >= 0) w[t] = r[i * K + j] as number;
        }
        const y = r[i * K + this.k] as number;
        w[to.length] = y;
        if (w.some((v) => v !== 0)) out.include(1, w);
      }
    }
    out.rows = this.rows;
    out.kept = remapKept(this.kept, this.k, targets, to.length);
    return out;
  }

  /**
   * The explicit upper-triangular factor A ((k+1)×(k+1), row-major) of [X | y]:
   * AᵀA = [X | y]ᵀ[X | y]; A[k][k]² is the residual sum of squares of the full design.
   */
  augmentedFactor(): Float64Array {
    this.settle();
    const k = this.k;
    const K = k + 1;
    const a = new Float64Array(K * K);
    let pos = 0;
    for (let i = 0; i < k; i++) {
      const s = Math.sqrt(this.d[i] as number);
      a[i * K + i] = s;
      for (let j = i + 1; j < k; j++) a[i * K + j] = s * (this.rbar[pos++] as number);
      a[i * K + k] = s * (this.thetab[i] as number);
    }
    a[k * K + k] = Math.sqrt(this.sserr);
    return a;
  }

  /** The rows as added ([x…, y] each), while they are few enough to keep; null after. */
  get keptRows(): readonly number[] | null {
    return this.kept;
  }

  /** Residual sum of squares of the full design (meaningful only when it has full rank). */
  get rssFull(): number {
    this.settle();
    return this.sserr;
  }

  clone(): LeastSquares {
    return LeastSquares.fromJSON(this.toJSON());
  }

  toJSON(): LeastSquaresJSON {
    this.settle();
    return {
      kind: "least-squares",
      version: 1,
      k: this.k,
      n: this.rows,
      d: Array.from(this.d),
      rbar: Array.from(this.rbar),
      thetab: Array.from(this.thetab),
      sserr: this.sserr,
      ...(this.kept ? { rows: [...this.kept] } : {}),
    };
  }

  static fromJSON(j: unknown): LeastSquares {
    const parsed = jsonSchema.safeParse(j);
    if (!parsed.success)
      throw new Error(
        `stored least-squares state is not valid: ${parsed.error.issues.map((i) => `${i.path.join(".")}: ${i.message}`).join("; ")}`,
      );
    const s = parsed.data;
    if (s.d.length !== s.k || s.thetab.length !== s.k || s.rbar.length !== (s.k * (s.k - 1)) / 2) {
      throw new Error(`stored least-squares state has arrays of the wrong length for k = ${s.k}`);
    }
    const ls = new LeastSquares(s.k);
    ls.rows = s.n;
    ls.d.set(s.d);
    ls.rbar.set(s.rbar);
    ls.thetab.set(s.thetab);
    ls.sserr = s.sserr;
    if (s.rows !== undefined && s.rows.length !== s.n * (s.k + 1)) {
      throw new Error(
        `stored least-squares state keeps ${s.rows.length} row values for ${s.n} rows of ${s.k + 1}`,
      );
    }
    ls.kept = s.rows ?? null;
    return ls;
  }
}
