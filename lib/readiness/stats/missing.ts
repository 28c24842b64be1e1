/**
 * Little's (1988) MCAR test from per-pattern sufficient statistics (JASA 83, 1198–1202).
 * Each missingness pattern over the m numeric columns keeps its row count, the means of its
 * observed columns and their centred cross-products (Welford updates; merged with the pairwise
 * formula of Chan, Golub & LeVeque 1979), so states from chunks or batches combine exactly.
 * EM for μ, Σ (divisor n) runs on these statistics: the conditional expectations of the missing
 * values are linear in the observed ones, so no second pass over the rows is needed.
 */
import { z } from "zod";
import { chiSquareUpper } from "./distributions";

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
}

const finite = z.number().refine(Number.isFinite, "must be a finite number");
const schema = z.object({
  kind: z.literal("pattern-moments"),
  version: z.literal(1),
  columns: z.array(z.string()),
  patterns: z.array(
    z.object({ observed: z.array(z.number().int().min(0)), count: z.number().int().min(1), mean: z.array(finite), comoment: z.array(finite) }),
  ),
});

export class PatternMoments {
  readonly columns: string[];
  // key: the observed-column bitmask as a number (exact up to 52 columns), else a 0/1 string
  private readonly patterns = new Map<number | string, Pattern>();
  private readonly keyBuf: string[];
  private readonly delta: Float64Array;

  constructor(columns: string[]) {
    this.columns = [...columns];
    this.keyBuf = new Array<string>(columns.length).fill("0");
    this.delta = new Float64Array(columns.length);
  }

  private keyOf(observed: number[]): number | string {
    const m = this.columns.length;
    if (m <= 52) return observed.reduce((k, j) => k + 2 ** j, 0);
    return Array.from({ length: m }, (_, j) => (observed.includes(j) ? "1" : "0")).join("");
  }

  private pattern(observed: number[], key: number | string): Pattern {
    let p = this.patterns.get(key);
    if (!p) {
      const q = observed.length;
      p = { observed, count: 0, mean: new Float64Array(q), comoment: new Float64Array(q * q) };
      this.patterns.set(key, p);
    }
    return p;
  }

  /** One row: values of the m columns in order, null (or NaN) for missing. */
  addRow(values: (number | null)[]): void {
    const m = this.columns.length;
    if (values.length !== m) throw new RangeError(`row has ${values.length} values, expected ${m}`);
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
    }
    const obs = p.observed;
    const q = obs.length;
    p.count++;
    const n = p.count;
    const d = this.delta;
    for (let a = 0; a < q; a++) {
      const v = values[obs[a] as number] as number;
      if (!Number.isFinite(v)) throw new RangeError(`value ${v} in column "${this.columns[obs[a] as number]}" is not a finite number`);
      const dv = v - (p.mean[a] as number);
      d[a] = dv;
      p.mean[a] = (p.mean[a] as number) + dv / n;
    }
    // M2 += δ_old · (x − mean_new)ᵀ, upper triangle only (mirrored when read)
    for (let a = 0; a < q; a++) {
      const da = d[a] as number;
      for (let b = a; b < q; b++) {
        const after = (values[obs[b] as number] as number) - (p.mean[b] as number);
        p.comoment[a * q + b] = (p.comoment[a * q + b] as number) + da * after;
      }
    }
  }

  /** Union of two row sets over the same columns. */
  merge(o: PatternMoments): void {
    if (o.columns.length !== this.columns.length || o.columns.some((c, i) => c !== this.columns[i])) {
      throw new RangeError("cannot merge missingness moments over different column lists");
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
            (dst.comoment[a * q + b] as number) + (src.comoment[a * q + b] as number) + ((delta[a] as number) * (delta[b] as number) * na * nb) / n;
        }
      }
      for (let a = 0; a < q; a++) dst.mean[a] = (dst.mean[a] as number) + ((delta[a] as number) * nb) / n;
      dst.count = n;
    }
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
    return { kind: "pattern-moments", version: 1, columns: [...this.columns], patterns: this.summary() };
  }

  static fromJSON(j: unknown): PatternMoments {
    const parsed = schema.safeParse(j);
    if (!parsed.success) throw new Error(`stored missingness moments are not valid: ${parsed.error.issues.map((i) => `${i.path.join(".")}: ${i.message}`).join("; ")}`);
    const s = parsed.data;
    const pm = new PatternMoments(s.columns);
    const m = s.columns.length;
    for (const p of s.patterns) {
      const q = p.observed.length;
      if (p.mean.length !== q || p.comoment.length !== q * q || p.observed.some((j, i) => j >= m || (i > 0 && j <= (p.observed[i - 1] as number)))) {
        throw new Error("stored missingness moments have a pattern of the wrong shape");
      }
      pm.patterns.set(pm.keyOf(p.observed), { observed: [...p.observed], count: p.count, mean: Float64Array.from(p.mean), comoment: Float64Array.from(p.comoment) });
    }
    return pm;
  }
}

/** Inverse of a symmetric positive-definite matrix by Cholesky; null when not positive definite. */
function spdInverse(a: number[][]): number[][] | null {
  const n = a.length;
  const l: number[][] = Array.from({ length: n }, () => new Array<number>(n).fill(0));
  for (let i = 0; i < n; i++) {
    for (let j = 0; j <= i; j++) {
      let s = (a[i] as number[])[j] as number;
      for (let t = 0; t < j; t++) s -= ((l[i] as number[])[t] as number) * ((l[j] as number[])[t] as number);
      if (i === j) {
        if (!(s > 1e-13 * Math.abs((a[i] as number[])[i] as number)) || !(s > 0)) return null;
        (l[i] as number[])[i] = Math.sqrt(s);
      } else (l[i] as number[])[j] = s / ((l[j] as number[])[j] as number);
    }
  }
  // inv = L⁻ᵀ L⁻¹
  const linv: number[][] = Array.from({ length: n }, () => new Array<number>(n).fill(0));
  for (let c = 0; c < n; c++) {
    for (let i = c; i < n; i++) {
      let s = i === c ? 1 : 0;
      for (let t = c; t < i; t++) s -= ((l[i] as number[])[t] as number) * ((linv[t] as number[])[c] as number);
      (linv[i] as number[])[c] = s / ((l[i] as number[])[i] as number);
    }
  }
  const inv: number[][] = Array.from({ length: n }, () => new Array<number>(n).fill(0));
  for (let i = 0; i < n; i++) {
    for (let j = 0; j <= i; j++) {
      let s = 0;
      for (let t = i; t < n; t++) s += ((linv[t] as number[])[i] as number) * ((linv[t] as number[])[j] as number);
      (inv[i] as number[])[j] = s;
      (inv[j] as number[])[i] = s;
    }
  }
  return inv;
}

const sub = (m: number[][], rows: number[], cols: number[]) => rows.map((i) => cols.map((j) => (m[i] as number[])[j] as number));

/**
 * Little's MCAR test: d² = Σ_j m_j (ȳ_j − μ̂_j)ᵀ Σ̂_j⁻¹ (ȳ_j − μ̂_j), df = Σ_j p_j − p, χ²(df).
 * μ̂, Σ̂: maximum-likelihood estimates under multivariate normality by EM (divisor n), from
 * the per-pattern statistics. Patterns with nothing observed add nothing; columns never
 * observed are left out. Null when df ≤ 0 (e.g. one pattern) or Σ̂ is singular.
 */
export function littleMcar(pm: PatternMoments): { statistic: number; df: number; pValue: number } | null {
  const all = pm.summary().filter((p) => p.observed.length > 0);
  const seen = new Set(all.flatMap((p) => p.observed));
  const cols = [...seen].sort((a, b) => a - b);
  const m = cols.length;
  if (m === 0 || all.length < 2) return null;
  const at = new Map(cols.map((c, i) => [c, i]));
  const pats = all.map((p) => ({ ...p, obs: p.observed.map((c) => at.get(c) as number) }));
  const N = pats.reduce((s, p) => s + p.count, 0);

  // Start: available-case means and variances, zero covariances.
  const mu = new Array<number>(m).fill(0);
  const cnt = new Array<number>(m).fill(0);
  for (const p of pats) p.obs.forEach((c, a) => { mu[c] = (mu[c] as number) + p.count * (p.mean[a] as number); cnt[c] = (cnt[c] as number) + p.count; });
  for (let c = 0; c < m; c++) mu[c] = (mu[c] as number) / (cnt[c] as number);
  let sigma: number[][] = Array.from({ length: m }, () => new Array<number>(m).fill(0));
  for (const p of pats) {
    const q = p.obs.length;
    p.obs.forEach((c, a) => {
      const dm = (p.mean[a] as number) - (mu[c] as number);
      (sigma[c] as number[])[c] = ((sigma[c] as number[])[c] as number) + (p.comoment[a * q + a] as number) + p.count * dm * dm;
    });
  }
  for (let c = 0; c < m; c++) {
    const v = ((sigma[c] as number[])[c] as number) / (cnt[c] as number);
    (sigma[c] as number[])[c] = v > 0 ? v : 1;
  }

  for (let iter = 0; iter < 5000; iter++) {
    // E-step per pattern: fill means ŷ = μ_m + B(ȳ_o − μ_o), B = Σ_mo Σ_oo⁻¹; within-pattern
    // second moments: [S, SBᵀ; BS, BSBᵀ + n·C], S = comoment, C = Σ_mm − BΣ_om.
    const t1 = new Array<number>(m).fill(0);
    const fills: { count: number; yhat: number[]; within: number[][] }[] = [];
    for (const p of pats) {
      const o = p.obs;
      const q = o.length;
      const mis = cols.map((_, i) => i).filter((i) => !o.includes(i));
      const yhat = new Array<number>(m).fill(0);
      o.forEach((c, a) => (yhat[c] = p.mean[a] as number));
      const within: number[][] = Array.from({ length: m }, () => new Array<number>(m).fill(0));
      const S = Array.from({ length: q }, (_, a) => Array.from({ length: q }, (_, b) => p.comoment[a * q + b] as number));
      o.forEach((c, a) => o.forEach((d, b) => ((within[c] as number[])[d] = (S[a] as number[])[b] as number)));
      if (mis.length > 0) {
        const inv = spdInverse(sub(sigma, o, o));
        if (!inv) return null;
        const smo = sub(sigma, mis, o);
        const B = smo.map((row) => o.map((_, b) => row.reduce((s, v, t) => s + v * ((inv[t] as number[])[b] as number), 0)));
        mis.forEach((c, r) => {
          let v = mu[c] as number;
          o.forEach((d, a) => (v += ((B[r] as number[])[a] as number) * ((p.mean[a] as number) - (mu[d] as number))));
          yhat[c] = v;
        });
        // BS (mis × o)
        const BS = B.map((row) => o.map((_, b) => row.reduce((s, v, t) => s + v * ((S[t] as number[])[b] as number), 0)));
        mis.forEach((c, r) => {
          o.forEach((d, b) => {
            (within[c] as number[])[d] = (BS[r] as number[])[b] as number;
            (within[d] as number[])[c] = (BS[r] as number[])[b] as number;
          });
          mis.forEach((e, s2) => {
            let v = 0;
            o.forEach((_, b) => (v += ((BS[r] as number[])[b] as number) * ((B[s2] as number[])[b] as number)));
            let cond = (sigma[c] as number[])[e] as number;
            o.forEach((_, a) => (cond -= ((B[r] as number[])[a] as number) * ((smo[s2] as number[])[a] as number)));
            (within[c] as number[])[e] = v + p.count * cond;
          });
        });
      }
      for (let c = 0; c < m; c++) t1[c] = (t1[c] as number) + p.count * (yhat[c] as number);
      fills.push({ count: p.count, yhat, within });
    }
    const muNew = t1.map((v) => v / N);
    const sigmaNew: number[][] = Array.from({ length: m }, () => new Array<number>(m).fill(0));
    for (const f of fills) {
      for (let i = 0; i < m; i++) {
        const di = (f.yhat[i] as number) - (muNew[i] as number);
        for (let j = 0; j < m; j++) {
          const dj = (f.yhat[j] as number) - (muNew[j] as number);
          (sigmaNew[i] as number[])[j] = ((sigmaNew[i] as number[])[j] as number) + ((f.within[i] as number[])[j] as number) + f.count * di * dj;
        }
      }
    }
    for (const row of sigmaNew) for (let j = 0; j < m; j++) row[j] = (row[j] as number) / N;
    let change = 0;
    for (let i = 0; i < m; i++) {
      const sd = Math.sqrt((sigmaNew[i] as number[])[i] as number) || 1;
      change = Math.max(change, Math.abs((muNew[i] as number) - (mu[i] as number)) / sd);
      for (let j = 0; j < m; j++) {
        const scale = Math.sqrt(((sigmaNew[i] as number[])[i] as number) * ((sigmaNew[j] as number[])[j] as number)) || 1;
        change = Math.max(change, Math.abs(((sigmaNew[i] as number[])[j] as number) - ((sigma[i] as number[])[j] as number)) / scale);
      }
    }
    for (let i = 0; i < m; i++) mu[i] = muNew[i] as number;
    sigma = sigmaNew;
    if (change < 1e-12) break;
  }

  let d2 = 0;
  let df = -m;
  for (const p of pats) {
    const o = p.obs;
    const inv = spdInverse(sub(sigma, o, o));
    if (!inv) return null;
    const diff = o.map((c, a) => (p.mean[a] as number) - (mu[c] as number));
    let quad = 0;
    for (let a = 0; a < o.length; a++) for (let b = 0; b < o.length; b++) quad += (diff[a] as number) * ((inv[a] as number[])[b] as number) * (diff[b] as number);
    d2 += p.count * quad;
    df += o.length;
  }
  if (df <= 0) return null;
  return { statistic: d2, df, pValue: chiSquareUpper(d2, df) };
}
