/**
 * The best subset of every size, exact, by branch and bound on the triangular factor (leaps
 * and bounds: Furnival & Wilson 1974, "Regressions by leaps and bounds", Technometrics 16,
 * 499–511). A node is a pair: the terms chosen, S, and the free terms after the last chosen,
 * F; its "bound" regression S ∪ F has an RSS no subset of the node's subtree can beat. The
 * node's factor holds the columns [forced][S][F], so the RSS of every prefix S ∪ F[0..i] is
 * read off its last column for free (Σ of the squares below a row). Child j chooses F[j] and
 * keeps F[j+1..]: its bound regression S ∪ F[j..] is the node's with the term blocks F[0..j−1]
 * deleted, one block at a time, re-triangularised by Givens rotations — no refit from rows, no
 * cross-product matrix. A child is cut when, for every size its subtree holds, the best RSS
 * found so far is at or below its bound; the later children, with larger bounds and fewer
 * sizes, are then cut too. Terms are ordered by the RSS their removal from the model of all
 * candidates costs, most first, so the bound regressions without the strong terms are cut early.
 */
import { givensTriangularise } from "./factor";
import { rssOfSubset, type Problem } from "./problem";

export interface SizeBest {
  rss: number;
  /** term indices into problem.terms, ascending */
  subset: number[];
}

/** Incumbents, e.g. from the forward and backward paths; improved in place to the exact optimum. */
export function bestSubsets(pr: Problem, seeds: number[][] = []): SizeBest[] {
  const m = pr.terms.length;
  const best: SizeBest[] = Array.from({ length: m + 1 }, () => ({ rss: Infinity, subset: [] }));
  const offer = (subset: number[], rss: number) => {
    const b = best[subset.length]!;
    if (rss < b.rss) {
      b.rss = rss;
      b.subset = [...subset].sort((x, y) => x - y);
    }
  };
  for (const s of seeds) offer(s, rssOfSubset(pr, s));

  // order: the term whose removal from the full model costs most RSS first
  const all = pr.terms.map((_, i) => i);
  const full = rssOfSubset(pr, all);
  const cost = all.map(
    (t) =>
      rssOfSubset(
        pr,
        all.filter((x) => x !== t),
      ) - full,
  );
  const order = [...all].sort((a, b) => cost[b]! - cost[a]! || a - b);
  const width = order.map((t) => pr.terms[t]!.width);

  // the full model's factor with the terms' columns in search order
  const K0 = pr.f.columns.length + 1;
  const bufs = Array.from({ length: m + 2 }, () => new Float64Array(K0 * K0));
  const src: number[] = [];
  for (let i = 0; i < pr.forced; i++) src.push(i);
  for (const t of order) for (let j = 0; j < pr.terms[t]!.width; j++) src.push(pr.terms[t]!.offset + j);
  src.push(K0 - 1);
  const root = bufs[0]!;
  for (let i = 0; i < K0; i++) for (let j = 0; j < K0; j++) root[i * K0 + j] = pr.f.a[i * K0 + src[j]!]!;
  givensTriangularise(root, K0, K0, K0);

  // node (S, F): its factor holds [forced][S][F] — the bound set S ∪ F. Every prefix S ∪ F[0..i]
  // is a subset of the node's subtree and is read off the factor for free (RSS of the first c
  // columns = Σ_{i ≥ c} A[i][y]²). Child j adds F[j] and keeps F[j+1..]: its bound set S ∪ F[j..]
  // is the node's with F[0..j−1] deleted, one term block after S at a time.
  const suffix = new Float64Array(K0 + 1);
  const visit = (depth: number, cur: number, chosen: number[], free: number[]) => {
    const buf = bufs[depth]!;
    suffix[cur + 1] = 0;
    for (let i = cur; i >= 0; i--) suffix[i] = suffix[i + 1]! + buf[i * K0 + cur]! ** 2;
    let col = pr.forced;
    for (const p of chosen) col += width[p]!;
    const base = col;
    for (let i = -1; i < free.length; i++) {
      if (i >= 0) col += width[free[i]!]!;
      const size = chosen.length + i + 1;
      const rss = suffix[col]!;
      if (rss < best[size]!.rss)
        offer(
          [...chosen, ...free.slice(0, i + 1)].map((p) => order[p]!),
          rss,
        );
    }
    let dim = cur;
    for (let j = 0; j < free.length; j++) {
      if (j > 0) {
        // delete F[j−1]'s columns (they sit right after S) and re-triangularise
        const w = width[free[j - 1]!]!;
        for (let r = 0; r <= dim; r++) {
          const a = r * K0;
          for (let c = base + w; c <= dim; c++) buf[a + c - w] = buf[a + c]!;
        }
        givensTriangularise(buf, dim + 1, dim + 1 - w, K0);
        dim -= w;
        const rss = buf[dim * K0 + dim]! ** 2;
        const size = chosen.length + free.length - j;
        if (rss < best[size]!.rss)
          offer(
            [...chosen, ...free.slice(j)].map((p) => order[p]!),
            rss,
          );
      }
      const rest = free.length - j - 1;
      if (rest === 0) break;
      const bound = buf[dim * K0 + dim]! ** 2;
      let cut = true;
      for (let z = chosen.length + 1; z <= chosen.length + 1 + rest && cut; z++)
        if (!(best[z]!.rss <= bound)) cut = false;
      if (cut) break;
      const child = bufs[depth + 1]!;
      for (let r = 0; r <= dim; r++) for (let c = r; c <= dim; c++) child[r * K0 + c] = buf[r * K0 + c]!;
      visit(depth + 1, dim, [...chosen, free[j]!], free.slice(j + 1));
    }
  };
  visit(
    0,
    K0 - 1,
    [],
    order.map((_, i) => i),
  );
  return best;
}
