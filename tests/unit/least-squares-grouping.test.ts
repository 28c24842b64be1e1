/**
 * The least-squares state rotates rows in four at a time. Its factor must be, to the last bit,
 * the one the published routine builds row by row: Miller (1992), Algorithm AS 274,
 * Applied Statistics 41, 458–478, subroutine INCLUD, ported below as plainly as it is printed
 * (weight 1 per row). Rows with zeros (indicator columns, a zero intercept) and row counts
 * that leave one to three rows waiting are included, so both the four-row pass and its
 * row-by-row fallback are compared.
 */
import { describe, expect, it } from "vitest";
import { LeastSquares } from "@/lib/readiness/stats";

/** AS 274 INCLUD over a whole row set: returns D, RBAR, THETAB and SSERR. */
function includRowByRow(k: number, rows: number[][], ys: number[]) {
  const d = new Array<number>(k).fill(0);
  const rbar = new Array<number>((k * (k - 1)) / 2).fill(0);
  const thetab = new Array<number>(k).fill(0);
  let sserr = 0;
  rows.forEach((row, r) => {
    const xrow = [...row];
    let y = ys[r] as number;
    let w = 1;
    let nextr = 0;
    let done = false;
    for (let i = 0; i < k && !done; i++) {
      if (w === 0) {
        done = true;
        break;
      }
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
        xrow[j] = xk - xi * (rbar[nextr] as number);
        rbar[nextr] = cbar * (rbar[nextr] as number) + sbar * xk;
        nextr++;
      }
      const yk = y;
      y = yk - xi * (thetab[i] as number);
      thetab[i] = cbar * (thetab[i] as number) + sbar * yk;
    }
    if (!done) sserr += w * y * y;
  });
  return { d, rbar, thetab, sserr };
}

function rng(seed: number) {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0; // mulberry32
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

/** Rows of an intercept (sometimes 0, as in a no-intercept design), a 4-level factor's indicators, and numbers with some zeros. */
function randomRows(seed: number, n: number, k: number) {
  const u = rng(seed);
  const rows: number[][] = [];
  const ys: number[] = [];
  for (let r = 0; r < n; r++) {
    const level = Math.floor(u() * 4);
    const row = [u() < 0.1 ? 0 : 1, level === 1 ? 1 : 0, level === 2 ? 1 : 0, level === 3 ? 1 : 0];
    while (row.length < k) row.push(u() < 0.15 ? 0 : (u() - 0.5) * 10 ** Math.floor(u() * 6 - 2));
    rows.push(row);
    ys.push(u() < 0.05 ? 0 : u() * 100 - 20);
  }
  return { rows, ys };
}

describe("least squares four rows at a time (against AS 274 INCLUD row by row)", () => {
  for (const n of [0, 1, 2, 3, 4, 5, 7, 8, 13, 64, 1001]) {
    it(`${n} rows: the same D, RBAR, THETAB and SSERR, bit for bit`, () => {
      const k = 7;
      const { rows, ys } = randomRows(1000 + n, n, k);
      const ls = new LeastSquares(k);
      rows.forEach((row, r) => ls.addRow(row, ys[r] as number));
      const got = ls.toJSON();
      const want = includRowByRow(k, rows, ys);
      expect(got.n).toBe(n);
      // toEqual tells +0 from −0, so this is equality to the bit for every entry
      expect(got.d).toEqual(want.d);
      expect(got.rbar).toEqual(want.rbar);
      expect(got.thetab).toEqual(want.thetab);
      expect(got.sserr).toEqual(want.sserr);
    });
  }

  it("reading the factor in the middle (a merge, a saved state) does not change what the later rows make", () => {
    const k = 6;
    const { rows, ys } = randomRows(77, 203, k);
    const whole = new LeastSquares(k);
    const readOften = new LeastSquares(k);
    rows.forEach((row, r) => {
      whole.addRow(row, ys[r] as number);
      readOften.addRow(row, ys[r] as number);
      if (r % 9 === 0) void readOften.rssFull; // settles the waiting rows one by one
    });
    expect(readOften.toJSON()).toEqual(whole.toJSON());
    expect(whole.toJSON().sserr).toEqual(includRowByRow(k, rows, ys).sserr);
  });
});
