/**
 * Findings about the planned model on the complete cases: collinearity and the sample-size /
 * degrees-of-freedom rules of lib/readiness/CHECKS.md.
 */
import { countOf, detectableR2, formatNumber } from "./format-number";
import type { Design } from "./design";
import { finding, list, quote } from "./findings";
import type { Plan, Thresholds } from "./plan";
import type { CollinearityReport, Finding, FitReport, ReadinessReport } from "./report";

export function collinearityFindings(
  col: CollinearityReport | null,
  aliased: { term: string; combination: string }[],
  design: Design,
  plan: Plan,
  t: Thresholds,
  emptyColumns: Set<string>,
): Finding[] {
  const out: Finding[] = [];
  const termOf = new Map(design.terms.flatMap((tm) => tm.columns.map((c) => [c, tm.term] as const)));
  for (const a of aliased) {
    if (emptyColumns.has(a.term)) continue; // a level without complete rows: reported by level.sparse / level.baseline-absent
    const trap = a.combination.includes("indicator trap");
    out.push(
      finding(
        "collinear.exact",
        "blocker",
        [termOf.get(a.term) ?? a.term],
        `On the complete rows, ${a.term} = ${a.combination}: the column adds no information and its coefficient cannot be estimated.`,
        trap
          ? "Choose a baseline level that the batch has, or add rows of the baseline level; the indicator columns of a factor must not add up to the intercept."
          : `Remove ${quote(a.term)} from the file or the plan (it is determined by the other columns), or check how it was computed.`,
        { detail: { column: a.term, combination: a.combination } },
      ),
    );
  }
  if (!col) return out;
  const interactions = plan.interactions.length > 0;
  const cols = col.correlations.columns;
  const numeric = new Set(design.numericColumns);
  for (let i = 0; i < cols.length; i++) {
    for (let j = i + 1; j < cols.length; j++) {
      const r = col.correlations.matrix[i]?.[j];
      if (r === undefined || !numeric.has(cols[i]!) || !numeric.has(cols[j]!)) continue;
      if (Math.abs(r) >= t.pairCorrelation) {
        out.push(
          finding(
            "collinear.pair",
            "warning",
            [cols[i]!, cols[j]!],
            `${quote(cols[i]!)} and ${quote(cols[j]!)} are almost collinear on the complete rows (r = ${r.toFixed(3)}).`,
            "Check whether both columns measure the same thing; the analyst may keep only one of them.",
            { detail: { r } },
          ),
        );
      }
    }
  }
  const caveat = interactions
    ? " With interactions in the plan, the figure covers each predictor with the interaction columns that contain it; term-wise VIFs mean little there."
    : "";
  for (const tm of col.terms) {
    const single = tm.df === 1 && tm.vif !== undefined;
    const value = single ? tm.vif! : tm.gvifScaled;
    const warnAt = single ? t.vifWarning : Math.sqrt(t.vifWarning);
    const strongAt = single ? t.vifStrong : Math.sqrt(t.vifStrong);
    if (!(value >= warnAt)) continue;
    const strong = value >= strongAt;
    out.push(
      finding(
        single ? "collinear.vif" : "collinear.gvif",
        "warning",
        [tm.term],
        single
          ? `${quote(tm.term)} has a variance inflation factor of ${value.toFixed(1)}${strong ? " (strong: ≥ " + t.vifStrong + ")" : ""}: the other predictors explain ${(100 * (1 - 1 / value)).toFixed(0)} % of it.${caveat}`
          : `${quote(tm.term)} (${tm.df} columns) has GVIF^(1/(2·df)) = ${value.toFixed(2)}${strong ? ` (strong: ≥ √${t.vifStrong})` : ""}, comparable to √VIF.${caveat}`,
        `Its coefficient will be imprecise. Check whether ${quote(tm.term)} largely repeats other predictors; the analyst may drop or combine them.`,
        { detail: { value, strong, gvif: tm.gvif, df: tm.df } },
      ),
    );
  }
  const vp = col.varianceProportions;
  col.conditionIndices.forEach((eta, k) => {
    if (!(eta >= t.conditionIndex)) return;
    const involved = vp.columns.filter((_, j) => (vp.matrix[k]?.[j] ?? 0) > t.varianceProportion);
    if (involved.length < 2) return;
    const terms = [...new Set(involved.map((c) => (c === "intercept" ? "intercept" : (termOf.get(c) ?? c))))];
    out.push(
      finding(
        "collinear.condition",
        "warning",
        terms,
        `Condition index ${eta.toFixed(1)} (≥ ${t.conditionIndex}) with more than ${t.varianceProportion} of the variance of ${list(involved.map(quote))} in that dimension: a near-dependency among them.`,
        "Check these columns for a near-exact relation (a sum, a unit conversion, a column that barely varies); centring or rescaling a predictor can also help the analyst.",
        { detail: { conditionIndex: eta, columns: involved } },
      ),
    );
  });
  return out;
}

export function dfFindings(
  n: number,
  p: number,
  residualDf: number,
  plan: Plan,
  t: Thresholds,
  sampleSize: ReadinessReport["sampleSize"],
  fit: FitReport | null,
  ready: boolean,
): Finding[] {
  const out: Finding[] = [];
  if (!ready) return out;
  const model = "the planned model";
  if (residualDf <= 0) {
    out.push(
      finding(
        "df.none",
        "blocker",
        [],
        `${n} complete rows for ${p} parameters${plan.intercept ? " and the intercept" : ""}: residual df = ${residualDf}, ${model} cannot be fitted.`,
        `Send at least ${p + (plan.intercept ? 1 : 0) + t.dfFloor} complete rows (more for a useful fit), or complete the missing values.`,
        {
          detail: { n, p, residualDf },
        },
      ),
    );
  } else if (residualDf < t.dfFloor) {
    out.push(
      finding(
        "df.low",
        "blocker",
        [],
        `Residual df = ${residualDf}, below the plan's floor of ${t.dfFloor} (${n} complete rows, ${p} parameters).`,
        `Add at least ${t.dfFloor - residualDf} complete rows, or complete the missing values of the model columns.`,
        {
          detail: { n, p, residualDf, floor: t.dfFloor },
        },
      ),
    );
  }
  if (p > 0 && n / p < t.perParameter) {
    out.push(
      finding(
        "df.per-parameter",
        "warning",
        [],
        `${(n / p).toFixed(1)} complete rows per parameter, below the plan's target of ${t.perParameter}.`,
        `About ${Math.ceil(t.perParameter * p)} complete rows would meet the target; ${Math.max(0, Math.ceil(t.perParameter * p) - n)} more are needed.`,
        {
          detail: { n, p, ratio: n / p, target: t.perParameter },
        },
      ),
    );
  }
  const g = sampleSize?.green;
  if (g && p > 0 && (n < g.overall || n < g.individual)) {
    out.push(
      finding(
        "df.green",
        "note",
        [],
        `Green's rules of thumb ask for n ≥ 50 + 8p = ${g.overall} (overall test) and n ≥ 104 + p = ${g.individual} (single coefficients); this batch has ${n} complete rows.`,
        "Rules of thumb for a medium effect; the pool of accepted batches usually meets them, one batch need not.",
        { detail: { n, p, ...g } },
      ),
    );
  }
  const r = sampleSize?.riley;
  if (r && n < r.required) {
    out.push(
      finding(
        "df.riley",
        "warning",
        [],
        `For an anticipated R² of ${plan.anticipatedR2}, Riley et al.'s criteria need n ≥ ${r.required} (i: ${r.criteria.i}, ii: ${r.criteria.ii}, iii: ${r.criteria.iii}${r.criteria.iv !== null ? `, iv: ${r.criteria.iv}` : ""}); there are ${n} complete rows.`,
        `The model needs ${r.required - n} more complete rows (over the pool) to limit overfitting and estimate the residual variance precisely.`,
        { detail: { n, p, ...r } },
      ),
    );
  }
  const s = sampleSize?.selection;
  if (s) {
    const m = s.candidates;
    const tooMany = m > 30;
    const short = n / m < t.perParameter;
    if (tooMany || short) {
      out.push(
        finding(
          "df.selection-budget",
          "warning",
          [],
          `Variable selection over ${m} candidate parameters: the budget counts all of them (${(n / m).toFixed(1)} rows per candidate)${tooMany ? `, and an exhaustive search of 2^${m} ≈ ${s.subsets.toExponential(1)} subsets is out of reach` : ""}.`,
          `Plan for ${Math.ceil(t.perParameter * m)} complete rows, or reduce the candidates by subject-matter knowledge before looking at the data.`,
          { detail: { n, candidates: m, subsets: s.subsets } },
        ),
      );
    }
  }
  const pw = fit?.power;
  if (pw && pw.detectableR2 !== null) {
    out.push(
      finding(
        "df.power",
        "note",
        [],
        `With ${countOf(n, "complete row")} and ${countOf(p, "parameter")}, the overall F test detects ${detectableR2(pw.detectableR2)} with power ${formatNumber(pw.power, "estimate")} at α = ${formatNumber(pw.alpha, "estimate")}.`,
        "A smaller true R² would likely go unnoticed; more complete rows lower this threshold.",
        {
          detail: { ...pw, n, p },
        },
      ),
    );
  }
  return out;
}
