/**
 * The best subset of every size, exact, by branch and bound on the triangular factor (leaps
 * and bounds: Furnival & Wilson 1974, "Regressions by leaps and bounds", Technometrics 16,
 * 499–511). The tree drops candidate terms from the model of all candidates, each subset
 * reached once (terms are dropped in increasing order); a node's RSS bounds every subset
 * below it from beneath, so a branch whose sizes all have a best RSS at or below it is cut.
 * A child's factor is its parent's with the term's columns deleted and re-triangularised by
 * Givens rotations: no refit from rows, no cross-product matrix. Terms are ordered by how
 * much RSS their removal costs, most first, so the big branches are cut early.
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
  const bufs = Array.from({ length: m + 1 }, () => new Float64Array(K0 * K0));
  const src: number[] = [];
  for (let i = 0; i < pr.forced; i++) src.push(i);
  for (const t of order) for (let j = 0; j < pr.terms[t]!.width; j++) src.push(pr.terms[t]!.offset + j);
  src.push(K0 - 1);
  const root = bufs[0]!;
  for (let i = 0; i < K0; i++) for (let j = 0; j < K0; j++) root[i * K0 + j] = pr.f.a[i * K0 + src[j]!]!;
  givensTriangularise(root, K0, K0, K0);

  // members: positions in `order`, ascending; offsets follow from the widths
  const visit = (depth: number, cur: number, members: number[], start: number) => {
    const buf = bufs[depth]!;
    const rss = buf[cur * K0 + cur]! ** 2;
    const size = members.length;
    offer(
      members.map((p) => order[p]!),
      rss,
    );
    let first = 0;
    while (first < size && members[first]! < start) first++;
    const nd = size - first;
    if (nd === 0) return;
    let offset = pr.forced;
    for (let i = 0; i < first; i++) offset += width[members[i]!]!;
    for (let i = first; i < size; i++) {
      const v = members[i]!;
      const w = width[v]!;
      // the child's subtree: sizes size − 1 − (size − 1 − i) … size − 1
      const lo = i;
      let cut = true;
      for (let z = lo; z <= size - 1 && cut; z++) if (!(best[z]!.rss <= rss)) cut = false;
      if (!cut) {
        const child = bufs[depth + 1]!;
        const rows = cur + 1;
        for (let r = 0; r < rows; r++) {
          const a = r * K0;
          for (let c = 0; c < offset; c++) child[a + c] = buf[a + c]!;
          for (let c = offset + w; c <= cur; c++) child[a + c - w] = buf[a + c]!;
        }
        givensTriangularise(child, rows, cur + 1 - w, K0);
        visit(depth + 1, cur - w, [...members.slice(0, i), ...members.slice(i + 1)], v + 1);
      }
      offset += w;
    }
  };
  visit(
    0,
    K0 - 1,
    order.map((_, i) => i),
    0,
  );
  return best;
}
