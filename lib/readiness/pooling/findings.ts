/** The findings of the pool's questions, in plain words with what to do. */
import { finding } from "../findings";
import type { Finding } from "../report";
import { colWords, fmtP } from "./poolability";
import type { ChowRow, InfluenceRow, PoolQuestions } from "./types";

const JUDGEMENT = "The test supports the analyst's judgement; it does not replace it.";

function notPoolable(r: ChowRow, what: string, against = "the rest of the pool"): Finding {
  const size = r.largest
    ? r.largest.shift >= 1
      ? ` The largest difference is in ${colWords(r.largest.column)}: ${r.largest.shift.toFixed(1)} standard errors.`
      : ` The largest coefficient shift is only ${r.largest.shift.toFixed(2)} standard errors (${r.largest.column}): a small difference that many rows make significant.`
    : "";
  return finding(
    "pool.not-poolable",
    "warning",
    r.largest && r.largest.term !== "intercept" ? [r.largest.term.split(":")[0]!] : [],
    `${what} ${r.label} does not describe the same relationship as ${against} (${r.kind === "predictive" ? "Chow's predictive test" : "Chow test"}, F = ${r.F!.toPrecision(3)} on ${r.df1} and ${r.df2} df, ${fmtP(r.p!)}).${size}`,
    `Ask the provider whether ${r.label} was measured or recorded differently (units, method, site); if the difference is real, model it (e.g. a batch term or interaction) rather than pooling blindly. ${JUDGEMENT}`,
    { detail: { id: r.id, F: r.F, df1: r.df1, df2: r.df2, p: r.p, kind: r.kind, largest: r.largest } },
  );
}

function influential(r: InfluenceRow, threshold: number): Finding {
  const l = r.largest!;
  const j = r.with.coefficients.findIndex((c) => c.column === l.column);
  const a = r.with.coefficients[j]?.estimate;
  const b = r.without.coefficients[j]?.estimate;
  const values =
    a != null && b != null ? ` (${b.toPrecision(4)} without it, ${a.toPrecision(4)} with it)` : "";
  return finding(
    "pool.influential-batch",
    "warning",
    l.term !== "intercept" ? [l.term.split(":")[0]!] : [],
    `${r.label} moves ${colWords(l.column, "the pool's ")} by ${l.shift.toFixed(1)} standard errors${values}; the threshold is ${threshold} standard error [common practice].`,
    `Look at ${r.label} before relying on ${colWords(l.column, "the pooled ")}: check its rows and how it was collected. ${JUDGEMENT}`,
    { detail: { id: r.id, largest: l, threshold } },
  );
}

export function poolFindings(q: Omit<PoolQuestions, "findings">, alpha: number): Finding[] {
  const out: Finding[] = [];
  const { poolability: pa, influence: inf } = q;
  for (const r of pa.batches) if (r.p !== null && r.p < alpha) out.push(notPoolable(r, "Batch"));
  for (const r of pa.providers)
    if (r.p !== null && r.p < alpha) out.push(notPoolable(r, "Provider", "the other providers' batches"));
  if (pa.candidate && pa.candidate.p !== null && pa.candidate.p < alpha)
    out.push(notPoolable(pa.candidate, "Batch under review", "the accepted pool"));
  for (const r of [...inf.batches, ...(inf.candidate ? [inf.candidate] : [])])
    if (r.influential) out.push(influential(r, inf.threshold));
  const s = q.selection?.stability;
  if (s) {
    for (const { term, share } of s.shares) {
      if (share >= 0.2 && share <= 0.8) {
        out.push(
          finding(
            "selection.unstable",
            "note",
            [term.split(":")[0]!],
            `${term} is chosen in ${Math.round(share * 100)} % of the leave-one-batch-out selections (BIC): whether it belongs in the model depends on which batches are pooled.`,
            `Decide on ${term} from subject-matter knowledge rather than from the selection; report the models with and without it.`,
            { detail: { term, share, folds: s.folds } },
          ),
        );
      }
    }
  }
  return out;
}
