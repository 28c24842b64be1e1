/**
 * Sufficient statistics for Little's (1988) MCAR test (see little-mcar.ts).
 * Each missingness pattern over the m numeric columns keeps its row count, the means of its
 * observed columns and their centred cross-products (Welford updates; merged with the pairwise
 * formula of Chan, Golub & LeVeque 1979), so states from chunks or batches combine exactly.
 * EM for μ, Σ runs on these statistics alone: the conditional expectations of the missing values
 * are linear in the observed ones, so no second pass over the rows is needed.
 */
import { z } from "zod";

interface Pattern {
  observed: number[]; // column indices observed in this pattern
  count: number;
  mean: Float64Array; // over observed columns (length observed.length)
  comoment: Float64Array; // observed × observed, row-major, centred cross-products
}

export interface PatternMomentsJSON {
  kind: "pattern-moments";
  version: 1;
  columns: string[];
  patterns: { observed: number[]; count: number; mean: number[]; comoment: number[] }[];
  /** true: too many patterns, moments dropped (see PatternMoments.MAX_CELLS) */
  overflowed?: boolean;
}

const finite = z.number().refine(Number.isFinite, "must be a finite number");
const schema = z.object({
  kind: z.literal("pattern-moments"),
  version: z.literal(1),
  columns: z.array(z.string()),
  overflowed: z.boolean().optional(),
  patterns: z.array(
    z.object({
      observed: z.array(z.number().int().min(0)),
      count: z.number().int().min(1),
      mean: z.array(finite),
      comoment: z.array(finite),
    }),
  ),
});

export class PatternMoments {
  readonly columns: string[];
  // key: the observed-column bitmask as a number (exact up to 52 columns), else a 0/1 string
  private readonly patterns = new Map<number | string, Pattern>();
  private readonly keyBuf: string[];
  private readonly delta: Float64Array;
  private readonly after: Float64Array;
  private cells = 0;
  private over = false;
  /**
   * Memory bound: when the patterns' statistics would exceed this many numbers (32 MB) the
   * moments are dropped and `overflowed` is set (too many patterns for Little's test to mean much).
   */
  static MAX_CELLS = 4_000_000;

  constructor(columns: string[]) {
    this.columns = [...columns];
    this.keyBuf = new Array<string>(columns.length).fill("0");
    this.delta = new Float64Array(columns.length);
    this.after = new Float64Array(columns.length);
  }

  private keyOf(observed: number[]): number | string {
    const m = this.columns.length;
    if (m <= 52) return observed.reduce((k, j) => k + 2 ** j, 0);
    return Array.from({ length: m }, (_, j) => (observed.includes(j) ? "1" : "0")).join("");
  }

  /** True when there were too many missingness patterns to keep their moments. */
  get overflowed(): boolean {
    return this.over;
  }

  private overflow(): void {
    this.over = true;
    this.patterns.clear();
    this.cells = 0;
  }

  private pattern(observed: number[], key: number | string): Pattern {
    let p = this.patterns.get(key);
    if (!p) {
      const q = observed.length;
      this.cells += q * q + q + 8;
      p = { observed, count: 0, mean: new Float64Array(q), comoment: new Float64Array(q * q) };
      this.patterns.set(key, p);
    }
    return p;
  }

  /** One row: values of the m columns in order, null (or NaN) for missing. */
  addRow(values: ArrayLike<number | null>): void {
    const m = this.columns.length;
    if (values.length !== m) throw new RangeError(`row has ${values.length} values, expected ${m}`);
    if (this.over) return;
    let key: number | string = 0;
    if (m <= 52) {
      let bit = 1;
      for (let j = 0; j < m; j++, bit *= 2) {
        const v = values[j];
        if (!(v === null || v === undefined || Number.isNaN(v))) key += bit;
      }
    } else {
      const kb = this.keyBuf;
      for (let j = 0; j < m; j++) {
        const v = values[j];
        kb[j] = v === null || v === undefined || Number.isNaN(v) ? "0" : "1";
      }
      key = kb.join("");
    }
    let p = this.patterns.get(key);
    if (!p) {
      const observed: number[] = [];
      for (let j = 0; j < m; j++) {
        const v = values[j];
        if (!(v === null || v === undefined || Number.isNaN(v))) observed.push(j);
      }
      p = this.pattern(observed, key);
      if (this.cells > PatternMoments.MAX_CELLS) {
        this.overflow();
        return;
      }
    }
    this.update(p, values as ArrayLike<number>);
  }

  /**
   * One row whose observed columns are the bits of `observed` (bit j: column j observed; at
   * most 30 columns): the same as addRow with the unobserved values null, without looking at them.
   */
  addMasked(values: ArrayLike<number>, observed: number): void {
    if (this.over) return;
    let p = this.patterns.get(observed);
    if (!p) {
      const obs: number[] = [];
      for (let j = 0; j < this.columns.length; j++) if (observed & (1 << j)) obs.push(j);
      p = this.pattern(obs, observed);
      if (this.cells > PatternMoments.MAX_CELLS) {
        this.overflow();
        return;
      }
    }
    this.update(p, values);
  }

  private update(p: Pattern, values: ArrayLike<number>): void {
    const obs = p.observed;
    const q = obs.length;
    p.count++;
    const n = p.count;
    const d = this.delta;
    for (let a = 0; a < q; a++) {
      const v = values[obs[a] as number] as number;
      if (!Number.isFinite(v))
        throw new RangeError(
          `value ${v} in column "${this.columns[obs[a] as number]}" is not a finite number`,
        );
      const dv = v - (p.mean[a] as number);
      d[a] = dv;
      p.mean[a] = (p.mean[a] as number) + dv / n;
    }
    // M2 += δ_old · (x − mean_new)ᵀ, upper triangle only (mirrored when read)
    const after = this.after;
    for (let b = 0; b < q; b++) after[b] = (values[obs[b] as number] as number) - (p.mean[b] as number);
    const cm = p.comoment;
    for (let a = 0; a < q; a++) {
      const da = d[a] as number;
      const row = a * q;
      for (let b = a; b < q; b++) cm[row + b] = (cm[row + b] as number) + da * (after[b] as number);
    }
  }

  /** Union of two row sets over the same columns. */
  merge(o: PatternMoments): void {
    if (o.columns.length !== this.columns.length || o.columns.some((c, i) => c !== this.columns[i])) {
      throw new RangeError("cannot merge missingness moments over different column lists");
    }
    if (this.over) return;
    if (o.over) {
      this.overflow();
      return;
    }
    for (const [key, src] of o.patterns) {
      const dst = this.pattern([...src.observed], key);
      const q = src.observed.length;
      const na = dst.count;
      const nb = src.count;
      const n = na + nb;
      const delta = Array.from({ length: q }, (_, a) => (src.mean[a] as number) - (dst.mean[a] as number));
      for (let a = 0; a < q; a++) {
        for (let b = 0; b < q; b++) {
          dst.comoment[a * q + b] =
            (dst.comoment[a * q + b] as number) +
            (src.comoment[a * q + b] as number) +
            ((delta[a] as number) * (delta[b] as number) * na * nb) / n;
        }
      }
      for (let a = 0; a < q; a++) dst.mean[a] = (dst.mean[a] as number) + ((delta[a] as number) * nb) / n;
      dst.count = n;
    }
    if (this.cells > PatternMoments.MAX_CELLS) this.overflow();
  }

  /** Patterns with their counts (observed column indices). */
  summary(): { observed: number[]; count: number; mean: number[]; comoment: number[] }[] {
    return [...this.patterns.values()].map((p) => {
      const q = p.observed.length;
      const c = Array.from(p.comoment);
      for (let a = 0; a < q; a++) for (let b = 0; b < a; b++) c[a * q + b] = c[b * q + a] as number;
      return { observed: [...p.observed], count: p.count, mean: Array.from(p.mean), comoment: c };
    });
  }

  toJSON(): PatternMomentsJSON {
    const j: PatternMomentsJSON = {
      kind: "pattern-moments",
      version: 1,
      columns: [...this.columns],
      patterns: this.summary(),
    };
    if (this.over) j.overflowed = true;
    return j;
  }

  static fromJSON(j: unknown): PatternMoments {
    const parsed = schema.safeParse(j);
    if (!parsed.success)
      throw new Error(
        `stored missingness moments are not valid: ${parsed.error.issues.map((i) => `${i.path.join(".")}: ${i.message}`).join("; ")}`,
      );
    const s = parsed.data;
    const pm = new PatternMoments(s.columns);
    const m = s.columns.length;
    if (s.overflowed) {
      pm.over = true;
      return pm;
    }
    for (const p of s.patterns) {
      const q = p.observed.length;
      if (
        p.mean.length !== q ||
        p.comoment.length !== q * q ||
        p.observed.some((j, i) => j >= m || (i > 0 && j <= (p.observed[i - 1] as number)))
      ) {
        throw new Error("stored missingness moments have a pattern of the wrong shape");
      }
      pm.cells += q * q + q + 8;
      pm.patterns.set(pm.keyOf(p.observed), {
        observed: [...p.observed],
        count: p.count,
        mean: Float64Array.from(p.mean),
        comoment: Float64Array.from(p.comoment),
      });
    }
    return pm;
  }
}
