/**
 * The size of a plan's model, for the editor and the study page: how many parameters the
 * planned regression has and the sample it needs. No server imports: runs in the browser.
 */
import { buildDesign, predictorsOf, DEFAULT_THRESHOLDS, type Plan, type PlanInput } from "@/lib/readiness";

export type ModelTerm = {
  term: string;
  kind: "numeric" | "boolean" | "category" | "interaction";
  df: number;
  columns: string[];
};

export type ModelSize = {
  terms: ModelTerm[];
  /** model parameters besides the intercept: numeric terms + (k−1) per category + interaction columns */
  p: number;
  intercept: boolean;
  /** residual df the study's pool should reach (thresholds.dfTarget, else dfFloor) */
  dfTarget: number;
  /** complete cases for the target: n − p − 1 = dfTarget (df headroom: lib/readiness/CHECKS.md "The model: p, n and residual df") */
  casesForTarget: number;
  /** complete cases by the events-per-parameter style rule: perParameter × p (lib/readiness/CHECKS.md df.per-parameter) */
  casesPerParameterRule: number;
};

/**
 * Parameters of the planned model under treatment coding (lib/readiness/design.ts): each
 * numeric or boolean predictor is 1 column, a category with k levels is k − 1 indicator
 * columns, an interaction a:b is (columns of a) × (columns of b). The intercept is counted
 * apart, so df headroom = complete cases − p − 1 when it is in the model.
 */
export function modelSize(input: PlanInput | Plan): ModelSize {
  const plan: Plan = {
    columns: input.columns,
    intercept: input.intercept ?? true,
    interactions: (input.interactions ?? []).filter(([a, b]) => a && b && a !== b),
    missingTokens: input.missingTokens ?? ["", "NA"],
    thresholds: input.thresholds ?? {},
  };
  const predictors = predictorsOf(plan);
  const design = buildDesign(plan, predictors);
  const kinds = new Map(predictors.map((p) => [p.name, p.kind]));
  const terms: ModelTerm[] = design.terms.map((t) => ({
    term: t.term,
    kind: kinds.get(t.term) ?? "interaction",
    df: t.df,
    columns: t.columns,
  }));
  const p = terms.reduce((s, t) => s + t.df, 0);
  const th = { ...DEFAULT_THRESHOLDS, ...plan.thresholds };
  const dfTarget = th.dfTarget ?? th.dfFloor;
  return {
    terms,
    p,
    intercept: plan.intercept,
    dfTarget,
    casesForTarget: dfTarget + p + (plan.intercept ? 1 : 0),
    casesPerParameterRule: Math.ceil(th.perParameter * p),
  };
}
