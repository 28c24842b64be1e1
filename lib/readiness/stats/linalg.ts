/** Small dense helpers (k ≲ 100) on row-major number[][] matrices. */

/** Upper-triangular factor R (c×c) of an m×c matrix by Householder reflections: MᵀM = RᵀR. */
export function triangularise(m: number[][], c: number): number[][] {
  const a = m.map((row) => row.slice(0, c));
  const rows = a.length;
  for (let j = 0; j < c && j < rows; j++) {
    let norm = 0;
    for (let i = j; i < rows; i++) norm = Math.hypot(norm, (a[i] as number[])[j] as number);
    if (norm === 0) continue;
    const ajj = (a[j] as number[])[j] as number;
    const alpha = ajj > 0 ? -norm : norm;
    // v = x − alpha·e1, stored in place
    const v: number[] = [];
    for (let i = j; i < rows; i++) v.push((a[i] as number[])[j] as number);
    v[0] = (v[0] as number) - alpha;
    let vv = 0;
    for (const t of v) vv += t * t;
    if (vv === 0) continue;
    for (let col = j; col < c; col++) {
      let dot = 0;
      for (let i = j; i < rows; i++) dot += (v[i - j] as number) * ((a[i] as number[])[col] as number);
      const f = (2 * dot) / vv;
      for (let i = j; i < rows; i++)
        (a[i] as number[])[col] = ((a[i] as number[])[col] as number) - f * (v[i - j] as number);
    }
    for (let i = j + 1; i < rows; i++) (a[i] as number[])[j] = 0;
  }
  const r: number[][] = [];
  for (let i = 0; i < c; i++) {
    const row = new Array<number>(c).fill(0);
    if (i < rows) for (let j = i; j < c; j++) row[j] = (a[i] as number[])[j] as number;
    r.push(row);
  }
  return r;
}

/** Solve R b = z for upper-triangular R (first n rows/columns). */
export function solveUpper(r: number[][], z: number[], n = z.length): number[] {
  const b = new Array<number>(n).fill(0);
  for (let i = n - 1; i >= 0; i--) {
    let s = z[i] as number;
    const row = r[i] as number[];
    for (let j = i + 1; j < n; j++) s -= (row[j] as number) * (b[j] as number);
    b[i] = s / (row[i] as number);
  }
  return b;
}

/** Inverse of an upper-triangular matrix (n×n) by column-wise back substitution. */
export function invertUpper(r: number[][], n = r.length): number[][] {
  const inv: number[][] = Array.from({ length: n }, () => new Array<number>(n).fill(0));
  for (let col = 0; col < n; col++) {
    const e = new Array<number>(n).fill(0);
    e[col] = 1;
    const x = solveUpper(r, e, n);
    for (let i = 0; i <= col; i++) (inv[i] as number[])[col] = x[i] as number;
  }
  return inv;
}

/** ln det(MᵀM) for the columns `cols` of M, from their triangular factor. */
export function logDetGram(m: number[][], cols: number[]): number {
  if (cols.length === 0) return 0;
  const sub = m.map((row) => cols.map((j) => row[j] as number));
  const r = triangularise(sub, cols.length);
  let s = 0;
  for (let i = 0; i < cols.length; i++) s += 2 * Math.log(Math.abs((r[i] as number[])[i] as number));
  return s;
}

export function columnNorm(m: number[][], j: number): number {
  let s = 0;
  for (const row of m) s = Math.hypot(s, row[j] as number);
  return s;
}
