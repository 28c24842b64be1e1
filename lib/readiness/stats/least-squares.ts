/**
 * Streaming least squares by square-root-free Givens rotations: Miller (1992), "Algorithm
 * AS 274: Least squares routines to supplement those of Gentleman", Applied Statistics 41,
 * 458–478 (the `includ` routine). The state is the triangular factor of the augmented
 * matrix [X | y] in the form Rbar (unit upper triangular, row-packed), D (row weights),
 * θ (Rbarᵀ-transformed y) and the residual sum of squares:
 *   [X | y]ᵀ[X | y] = [Rbar θ; 0 1]ᵀ diag(D, sserr) [Rbar θ; 0 1].
 * Memory is O(k²) whatever the number of rows (plus a bounded copy of the first rows, kept only
 * while a batch is small, for refining the coefficients: refine.ts); XᵀX is never formed.
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

  constructor(k: number) {
    if (!Number.isInteger(k) || k < 1)
      throw new RangeError(`LeastSquares needs at least one design column (got k = ${k})`);
    this.k = k;
    this.d = new Float64Array(k);
    this.rbar = new Float64Array((k * (k - 1)) / 2);
    this.thetab = new Float64Array(k);
    this.work = new Float64Array(k);
  }

  /** Number of rows included. */
  get n(): number {
    return this.rows;
  }

  /** Add one complete case (x has k entries, the intercept's 1 included by the caller). */
  addRow(x: ArrayLike<number>, y: number): void {
    const k = this.k;
    if (x.length !== k) throw new RangeError(`row has ${x.length} design values, expected ${k}`);
    const w = this.work;
    for (let i = 0; i < k; i++) {
      const v = x[i] as number;
      if (v - v !== 0) throw new RangeError(`design value ${v} in position ${i + 1} is not a finite number`);
      w[i] = v;
    }
    if (y - y !== 0) throw new RangeError(`response value ${y} is not a finite number`);
    this.kept = keepRow(this.kept, x, y);
    this.include(1, w, y);
    this.rows++;
  }

  /**
   * AS 274 `includ`: rotate the weighted row (w, xrow, y) into the factor. Overwrites xrow.
   */
  private include(weight: number, xrow: Float64Array, y: number): void {
    const k = this.k;
    const d = this.d;
    const rbar = this.rbar;
    const thetab = this.thetab;
    let w = weight;
    let nextr = 0;
    for (let i = 0; i < k; i++) {
      if (w === 0) return;
      const xi = xrow[i] as number;
      if (xi === 0) {
        nextr += k - i - 1;
        continue;
      }
      const di = d[i] as number;
      const dpi = di + w * xi * xi;
      const cbar = di / dpi;
      const sbar = (w * xi) / dpi;
      w = cbar * w;
      d[i] = dpi;
      for (let j = i + 1; j < k; j++) {
        const xk = xrow[j] as number;
        const r = rbar[nextr] as number;
        xrow[j] = xk - xi * r;
        rbar[nextr] = cbar * r + sbar * xk;
        nextr++;
      }
      const yk = y;
      const t = thetab[i] as number;
      y = yk - xi * t;
      thetab[i] = cbar * t + sbar * yk;
    }
    this.sserr += w * y * y;
  }

  /** Feed every row of another factor (weights D) into this one: the factor of the union of rows. */
  private absorb(other: LeastSquares, position: (j: number) => number): void {
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
      this.include(di, w, other.thetab[i] as number);
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
    const out = new LeastSquares(to.length);
    const targets = from.map((name) => index.get(name) ?? -1);
    if (targets.every((t) => t >= 0)) {
      out.absorb(this, (j) => targets[j] as number);
    } else {
      // Dropping columns: go through the explicit augmented factor rows.
      const K = this.k + 1;
      const r = this.augmentedFactor();
      const w = new Float64Array(to.length);
      for (let i = 0; i < K; i++) {
        w.fill(0);
        for (let j = 0; j < this.k; j++) {
          const t = targets[j] as number;
          if (t >= 0) w[t] = r[i * K + j] as number;
        }
        const y = r[i * K + this.k] as number;
        if (y !== 0 || w.some((v) => v !== 0)) out.include(1, w, y);
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
    return this.sserr;
  }

  clone(): LeastSquares {
    return LeastSquares.fromJSON(this.toJSON());
  }

  toJSON(): LeastSquaresJSON {
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
