/**
 * Little's MCAR test (Little 1988, JASA 83, 1198–1202) from per-pattern sufficient statistics.
 * EM for μ, Σ (maximum likelihood under multivariate normality, divisor n): for a pattern with
 * observed block o and missing block m, B = Σ_mo Σ_oo⁻¹, the filled mean ŷ_m = μ_m + B(ȳ_o − μ_o),
 * and the pattern's within cross-products are [S, SBᵀ; BS, BSBᵀ + n·(Σ_mm − BΣ_om)], S its own
 * centred cross-products. Flat Float64Array storage, Cholesky solves, no matrix inverse kept.
 */
import { chiSquareUpper } from "./distributions";
import type { PatternMoments } from "./missing";

interface Pat {
  n: number;
  o: Int32Array;
  mis: Int32Array;
  mean: Float64Array; // observed means
  S: Float64Array; // q×q centred cross-products
}

/** In-place Cholesky of the q×q block a (row-major, stride q); false when not positive definite. */
function cholesky(a: Float64Array, q: number): boolean {
  for (let j = 0; j < q; j++) {
    let s = a[j * q + j] as number;
    for (let t = 0; t < j; t++) s -= (a[j * q + t] as number) ** 2;
    if (!(s > 0)) return false;
    const d = Math.sqrt(s);
    a[j * q + j] = d;
    for (let i = j + 1; i < q; i++) {
      let v = a[i * q + j] as number;
      for (let t = 0; t < j; t++) v -= (a[i * q + t] as number) * (a[j * q + t] as number);
      a[i * q + j] = v / d;
    }
  }
  return true;
}

/** Solve (L Lᵀ) x = b in place (b length q). */
function cholSolve(l: Float64Array, q: number, b: Float64Array): void {
  for (let i = 0; i < q; i++) {
    let s = b[i] as number;
    for (let t = 0; t < i; t++) s -= (l[i * q + t] as number) * (b[t] as number);
    b[i] = s / (l[i * q + i] as number);
  }
  for (let i = q - 1; i >= 0; i--) {
    let s = b[i] as number;
    for (let t = i + 1; t < q; t++) s -= (l[t * q + i] as number) * (b[t] as number);
    b[i] = s / (l[i * q + i] as number);
  }
}

/**
 * d² = Σ_j m_j (ȳ_j − μ̂_j)ᵀ Σ̂_j⁻¹ (ȳ_j − μ̂_j), df = Σ_j p_j − p, p-value from χ²(df).
 * Patterns with nothing observed add nothing; columns never observed are left out.
 * Null when df ≤ 0 (e.g. a single pattern), Σ̂ is not positive definite, or the state overflowed
 * (more missingness patterns than PatternMoments keeps).
 */
export function littleMcar(pm: PatternMoments): { statistic: number; df: number; pValue: number } | null {
  if (pm.overflowed) return null;
  const raw = pm.summary().filter((p) => p.observed.length > 0);
  const cols = [...new Set(raw.flatMap((p) => p.observed))].sort((a, b) => a - b);
  const m = cols.length;
  if (m === 0 || raw.length < 2) return null;
  const at = new Map(cols.map((c, i) => [c, i]));
  const pats: Pat[] = raw.map((p) => {
    const o = Int32Array.from(p.observed.map((c) => at.get(c) as number));
    const isObs = new Uint8Array(m);
    for (const c of o) isObs[c] = 1;
    const mis = Int32Array.from(Array.from({ length: m }, (_, i) => i).filter((i) => !isObs[i]));
    return { n: p.count, o, mis, mean: Float64Array.from(p.mean), S: Float64Array.from(p.comoment) };
  });
  const N = pats.reduce((s, p) => s + p.n, 0);

  // Start: available-case means and variances, no covariance.
  const mu = new Float64Array(m);
  const cnt = new Float64Array(m);
  for (const p of pats)
    p.o.forEach(
      (c, a) => (
        (mu[c] = (mu[c] as number) + p.n * (p.mean[a] as number)),
        (cnt[c] = (cnt[c] as number) + p.n)
      ),
    );
  for (let c = 0; c < m; c++) mu[c] = (mu[c] as number) / (cnt[c] as number);
  let sigma = new Float64Array(m * m);
  for (const p of pats) {
    const q = p.o.length;
    p.o.forEach((c, a) => {
      const dm = (p.mean[a] as number) - (mu[c] as number);
      sigma[c * m + c] = (sigma[c * m + c] as number) + (p.S[a * q + a] as number) + p.n * dm * dm;
    });
  }
  for (let c = 0; c < m; c++) {
    const v = (sigma[c * m + c] as number) / (cnt[c] as number);
    sigma[c * m + c] = v > 0 ? v : 1;
  }

  const L = new Float64Array(m * m);
  const B = new Float64Array(m * m); // r×q
  const BS = new Float64Array(m * m); // r×q
  const col = new Float64Array(m);
  const yhat = new Float64Array(m);
  const t1 = new Float64Array(m);
  const acc = new Float64Array(m * m);

  const factorObserved = (p: Pat): boolean => {
    const q = p.o.length;
    for (let a = 0; a < q; a++)
      for (let b = 0; b < q; b++) L[a * q + b] = sigma[(p.o[a] as number) * m + (p.o[b] as number)] as number;
    return cholesky(L, q);
  };

  // EM converges linearly; bound the work (≈ patterns·m³ per iteration) so a pathological
  // state cannot stall a check. At the cap the estimates are already close to the MLE.
  const perIter = pats.length * (m * m * m + 1);
  const maxIter = Math.max(200, Math.min(10_000, Math.floor(2e9 / perIter)));
  for (let iter = 0; iter < maxIter; iter++) {
    t1.fill(0);
    acc.fill(0);
    for (const p of pats) {
      const { o, mis, n, S } = p;
      const q = o.length;
      const r = mis.length;
      for (let a = 0; a < q; a++) yhat[o[a] as number] = p.mean[a] as number;
      // within-pattern cross-products of the observed block
      for (let a = 0; a < q; a++) {
        const row = (o[a] as number) * m;
        for (let b = 0; b < q; b++) {
          const idx = row + (o[b] as number);
          acc[idx] = (acc[idx] as number) + (S[a * q + b] as number);
        }
      }
      if (r > 0) {
        if (!factorObserved(p)) return null;
        // rows of B: Σ_oo⁻¹ Σ_o,mis[i]
        for (let i = 0; i < r; i++) {
          const c = mis[i] as number;
          for (let a = 0; a < q; a++) col[a] = sigma[(o[a] as number) * m + c] as number;
          cholSolve(L, q, col);
          let v = mu[c] as number;
          for (let a = 0; a < q; a++) {
            B[i * q + a] = col[a] as number;
            v += (col[a] as number) * ((p.mean[a] as number) - (mu[o[a] as number] as number));
          }
          yhat[c] = v;
        }
        for (let i = 0; i < r; i++) {
          for (let b = 0; b < q; b++) {
            let s = 0;
            for (let a = 0; a < q; a++) s += (B[i * q + a] as number) * (S[a * q + b] as number);
            BS[i * q + b] = s;
            const ci = mis[i] as number;
            const ob = o[b] as number;
            acc[ci * m + ob] = (acc[ci * m + ob] as number) + s;
            acc[ob * m + ci] = (acc[ob * m + ci] as number) + s;
          }
        }
        for (let i = 0; i < r; i++) {
          const ci = mis[i] as number;
          for (let j = 0; j < r; j++) {
            const cj = mis[j] as number;
            let bsb = 0;
            let bso = 0;
            for (let a = 0; a < q; a++) {
              bsb += (BS[i * q + a] as number) * (B[j * q + a] as number);
              bso += (B[i * q + a] as number) * (sigma[(o[a] as number) * m + cj] as number);
            }
            acc[ci * m + cj] =
              (acc[ci * m + cj] as number) + bsb + n * ((sigma[ci * m + cj] as number) - bso);
          }
        }
      }
      // between-pattern part, centred at the current μ (no cancellation for large means)
      for (let i = 0; i < m; i++) {
        const di = (yhat[i] as number) - (mu[i] as number);
        t1[i] = (t1[i] as number) + n * di;
        for (let j = 0; j < m; j++)
          acc[i * m + j] = (acc[i * m + j] as number) + n * di * ((yhat[j] as number) - (mu[j] as number));
      }
    }
    const next = new Float64Array(m * m);
    let change = 0;
    for (let i = 0; i < m; i++) {
      for (let j = 0; j < m; j++) {
        next[i * m + j] = (acc[i * m + j] as number) / N - ((t1[i] as number) / N) * ((t1[j] as number) / N);
      }
    }
    for (let i = 0; i < m; i++) {
      const sd = Math.sqrt(next[i * m + i] as number) || 1;
      change = Math.max(change, Math.abs((t1[i] as number) / N) / sd);
      for (let j = 0; j < m; j++) {
        const scale = Math.sqrt((next[i * m + i] as number) * (next[j * m + j] as number)) || 1;
        change = Math.max(
          change,
          Math.abs((next[i * m + j] as number) - (sigma[i * m + j] as number)) / scale,
        );
      }
      mu[i] = (mu[i] as number) + (t1[i] as number) / N;
    }
    sigma = next;
    if (change < 1e-12) break;
  }

  let d2 = 0;
  let df = -m;
  for (const p of pats) {
    const q = p.o.length;
    if (!factorObserved(p)) return null;
    for (let a = 0; a < q; a++) col[a] = (p.mean[a] as number) - (mu[p.o[a] as number] as number);
    const diff = Float64Array.from(col.subarray(0, q));
    cholSolve(L, q, col);
    let quad = 0;
    for (let a = 0; a < q; a++) quad += (diff[a] as number) * (col[a] as number);
    d2 += p.n * quad;
    df += q;
  }
  if (df <= 0) return null;
  return { statistic: d2, df, pValue: chiSquareUpper(d2, df) };
}
