/**
 * The selection preview of lib/readiness/pooling against R on pools built by the real engine:
 * - best subset of each size for numeric candidates: leaps::regsubsets (Debian r-cran-leaps,
 *   exhaustive) — RSS, Mallows' Cp, BIC (leaps' n·log(RSS/TSS) + edf·log n, so ours minus
 *   n·log(TSS/n)), adjusted R², and the subset's terms;
 * - with categorical terms (a term enters with all its indicator columns) and a required term:
 *   an exhaustive loop of lm fits over term subsets in R, AIC and BIC by extractAIC;
 * - forward and backward paths: step() with k = 2 and k = log(n) over the same scope;
 * - leave-one-batch-out CV: each fold re-selected by regsubsets, fitted by lm, predicted by
 *   predict.lm; the stability shares from the folds' BIC-chosen models.
 * Skipped, with the reason printed, when Rscript or leaps is not installed.
 */
import { beforeAll, describe, expect, it } from "vitest";
import { poolQuestions, type SelectionPreview } from "@/lib/readiness";
import { rscriptAvailable, runRJson, tempDir } from "../helpers/rscript";
import { makePool, writePoolCsv, type PoolSpec } from "../fixtures/pool/data";

const R = rscriptAvailable(["leaps"]);
if (!R.ok) console.warn(`pool-select-r tests skipped: ${R.reason}`);

const rel = (x: number, y: number) => Math.abs(x - y) / Math.max(Math.abs(y), 1e-300);
const one = (v: number | number[]) => (Array.isArray(v) ? v[0]! : v);
const list = (v: string | string[] | undefined) => (v === undefined ? [] : Array.isArray(v) ? v : [v]);

interface RPath {
  steps: string[];
  aic: number[];
  terms: string | string[];
}
interface ROut {
  n: number[];
  leaps?: {
    rss: number[];
    cp: number[];
    bic: number[];
    adjr2: number[];
    tss: number[];
    which: (string | string[])[];
  };
  lobo?: { mspe: number[]; share: number[]; names: string[] };
  loop?: {
    terms: string | string[];
    rss: number[];
    edf: number[];
    aic: number[];
    bic: number[];
    adjR2: number[];
    cp: number[];
  }[];
  paths: Record<"aic" | "bic", { forward: RPath; backward: RPath }>;
}

function selectionOf(spec: PoolSpec) {
  let sel: SelectionPreview;
  let r: ROut;
  beforeAll(async () => {
    const pool = await makePool(spec);
    sel = poolQuestions(pool.members, pool.plan).selection!;
    const s = spec.selection!;
    const mode =
      (s.candidates as string[]).length > 25 ? "paths" : (spec.factors ?? []).length ? "loop" : "leaps";
    const file = writePoolCsv(pool, tempDir());
    r = runRJson<ROut>(
      "pool-select.R",
      [file, (s.candidates as string[]).join(","), (s.required ?? []).join(","), mode],
      300_000,
    );
  });
  return { sel: () => sel, r: () => r };
}

/** the path's changes up to where step() stops, in step()'s notation ("+ x1", "- x2") */
function expectPath(ours: SelectionPreview["forward"]["aic"], theirs: RPath, sign: "+" | "-") {
  const changes = ours.steps.slice(1, ours.stop + 1).map((s) => `${sign} ${s.change}`);
  expect(changes).toEqual(list(theirs.steps).slice(1));
  // step()'s AIC column is extractAIC with the same k at each accepted model
  ours.steps
    .slice(0, ours.stop + 1)
    .forEach((s, i) => expect(rel(s[ours.criterion], theirs.aic[i]!)).toBeLessThan(1e-9));
}

function pathChecks(get: () => { sel: SelectionPreview; r: ROut }) {
  it.each(["aic", "bic"] as const)("forward and backward paths equal step() with k = %s", (c) => {
    const { sel, r } = get();
    expectPath(sel.forward[c], r.paths[c].forward, "+");
    expectPath(sel.backward[c], r.paths[c].backward, "-");
    const stopF = sel.forward[c].steps[sel.forward[c].stop]!;
    expect([...stopF.terms].sort()).toEqual(
      list(r.paths[c].forward.terms)
        .filter((t) => sel.candidates.includes(t))
        .sort(),
    );
  });
}

describe.skipIf(!R.ok)(
  "selection against leaps::regsubsets, step() and an R loop of lm + predict (numeric candidates)",
  () => {
    const spec: PoolSpec = {
      numeric: 8,
      sizes: [45, 60, 38, 52, 41],
      seed: 31,
      beta: [1, 0.5, 0, 0.3, 0, 0.15, 0, 0.08],
      noise: 1.5,
      selection: { candidates: ["x1", "x2", "x3", "x4", "x5", "x6", "x7", "x8"] },
    };
    const g = selectionOf(spec);

    it("is exhaustive and its best subset of each size equals regsubsets' (RSS, Cp, BIC, adjusted R², terms)", () => {
      const sel = g.sel();
      const L = g.r().leaps!;
      const n = one(g.r().n);
      const tss = one(L.tss);
      expect(sel.exhaustive).toBe(true);
      expect(sel.bySize.length).toBe(spec.numeric + 1);
      for (let size = 1; size <= spec.numeric; size++) {
        const b = sel.bySize[size]!;
        expect(rel(b.rss, L.rss[size - 1]!)).toBeLessThan(1e-9);
        expect(rel(b.cp, L.cp[size - 1]!)).toBeLessThan(1e-8);
        expect(rel(b.bic - n * Math.log(tss / n), L.bic[size - 1]!)).toBeLessThan(1e-9);
        expect(rel(b.adjR2, L.adjr2[size - 1]!)).toBeLessThan(1e-9);
        expect([...b.terms].sort()).toEqual(list(L.which[size - 1]).sort());
      }
    });

    pathChecks(() => ({ sel: g.sel(), r: g.r() }));

    it("leave-one-batch-out prediction errors and stability equal the R loop", () => {
      const sel = g.sel();
      const lo = g.r().lobo!;
      expect(sel.lobo!.folds).toBe(spec.sizes.length);
      sel.lobo!.mspe.forEach((v, i) => expect(rel(v!, lo.mspe[i]!)).toBeLessThan(1e-9));
      const best = lo.mspe.indexOf(Math.min(...lo.mspe));
      expect(sel.lobo!.size).toBe(best);
      for (const s of sel.stability!.shares)
        expect(s.share).toBeCloseTo(lo.share[lo.names.indexOf(s.term)]!, 12);
      expect(sel.picks.find((p) => p.criterion === "lobo")!.size).toBe(best);
    });
  },
);

describe.skipIf(!R.ok)(
  "selection with categorical terms and a required term against an exhaustive R loop of lm fits",
  () => {
    const spec: PoolSpec = {
      numeric: 5,
      factors: [
        ["a", "b", "c"],
        ["p", "q", "r", "s"],
      ],
      sizes: [70, 55, 64],
      seed: 41,
      beta: [0.8, 0.2, 0, 0.1, 0.5],
      noise: 1.2,
      selection: { candidates: ["x1", "x2", "x3", "x4", "f1", "f2"], required: ["x5"] },
    };
    const g = selectionOf(spec);

    it("best subsets by term (RSS, edf, AIC and BIC by extractAIC, Cp, adjusted R², terms)", () => {
      const sel = g.sel();
      const loop = g.r().loop!;
      expect(sel.required).toEqual(["x5"]);
      expect(sel.bySize.length).toBe(loop.length);
      sel.bySize.forEach((b, i) => {
        const l = loop[i]!;
        expect([...b.terms].sort()).toEqual(list(l.terms).sort());
        expect(b.parameters).toBe(one(l.edf));
        expect(rel(b.rss, one(l.rss))).toBeLessThan(1e-9);
        expect(rel(b.aic, one(l.aic))).toBeLessThan(1e-9);
        expect(rel(b.bic, one(l.bic))).toBeLessThan(1e-9);
        expect(rel(b.cp, one(l.cp))).toBeLessThan(1e-8);
        expect(rel(b.adjR2, one(l.adjR2))).toBeLessThan(1e-9);
      });
    });

    pathChecks(() => ({ sel: g.sel(), r: g.r() }));
  },
);

describe.skipIf(!R.ok)("above 25 candidate terms: no exhaustive search, the paths against step()", () => {
  const m = 27;
  const spec: PoolSpec = {
    numeric: m,
    sizes: [60, 70, 55],
    seed: 51,
    beta: Array.from({ length: m }, (_, i) => (i < 5 ? 1 - 0.15 * i : 0)),
    selection: { candidates: Array.from({ length: m }, (_, i) => `x${i + 1}`) },
  };
  const g = selectionOf(spec);

  it("says why (2^m subsets) and gives the forward path's models by size", () => {
    const sel = g.sel();
    expect(sel.exhaustive).toBe(false);
    expect(sel.why).toMatch(/2\^27 ≈ 1\.3e\+8 subsets: an exhaustive search is out of reach/);
    expect(sel.bySize.map((b) => b.terms)).toEqual(sel.forward.aic.steps.map((s) => s.terms));
  });

  pathChecks(() => ({ sel: g.sel(), r: g.r() }));
});
