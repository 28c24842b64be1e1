/**
 * The model size the plan editor and the study page show (lib/studies/model-size.ts) against
 * R: p = ncol(model.matrix(formula, data)) − 1 for the plan's predictors and interactions,
 * with each category a factor of the plan's levels and treatment contrasts (R's default,
 * the engine's coding). Skipped when Rscript is not installed.
 */
import { execFileSync } from "node:child_process";
import { describe, expect, test } from "vitest";
import { BARLEY_PLAN, HEAT_PUMP_PLAN } from "@/lib/demo/plans";
import type { PlanInput } from "@/lib/readiness";
import { modelSize } from "@/lib/studies/model-size";

function hasR(): boolean {
  try {
    execFileSync("Rscript", ["--version"], { stdio: "ignore" });
    return true;
  } catch {
    return false;
  }
}

const q = (s: string) => JSON.stringify(s);
const rName = (s: string) => `\`${s}\``;

/** p by R's model.matrix: one data row per level (recycled), factors with the plan's levels, baseline first. */
function pByR(plan: PlanInput): number {
  const preds = plan.columns.filter((c) => c.role === "predictor");
  const cols = preds.map((c) => {
    if (c.type === "category") {
      const levels = c.levels ?? [];
      const ordered = c.baseline ? [c.baseline, ...levels.filter((l) => l !== c.baseline)] : levels;
      return `${rName(c.name)} = factor(rep_len(c(${ordered.map(q).join(",")}), 12), levels = c(${ordered.map(q).join(",")}))`;
    }
    if (c.type === "boolean") return `${rName(c.name)} = rep_len(c(TRUE, FALSE), 12)`;
    return `${rName(c.name)} = rnorm(12)`;
  });
  const terms = [
    ...preds.map((c) => rName(c.name)),
    ...(plan.interactions ?? []).map(([a, b]) => `${rName(a)}:${rName(b)}`),
  ];
  const script = [
    "set.seed(1)",
    `d <- data.frame(${cols.join(", ")}, check.names = FALSE)`,
    `m <- model.matrix(~ ${terms.join(" + ")}, data = d)`,
    "cat(ncol(m) - 1)",
  ].join("\n");
  return Number(execFileSync("Rscript", ["-e", script], { encoding: "utf8" }).trim());
}

const withInteractions = (plan: PlanInput, interactions: [string, string][]): PlanInput => ({
  ...structuredClone(plan),
  interactions,
});

const CASES: [string, PlanInput][] = [
  ["barley as seeded", BARLEY_PLAN],
  ["barley + nitrogen:soil", withInteractions(BARLEY_PLAN, [["nitrogen_kg_ha", "soil"]])],
  [
    "barley + soil:variety + nitrogen:irrigation",
    withInteractions(BARLEY_PLAN, [
      ["soil", "variety"],
      ["nitrogen_kg_ha", "irrigation_mm"],
    ]),
  ],
  ["heat pump as seeded", HEAT_PUMP_PLAN],
  ["heat pump + type:insulation", withInteractions(HEAT_PUMP_PLAN, [["heat_pump_type", "insulation_band"]])],
];

describe.skipIf(!hasR())("modelSize against R model.matrix", () => {
  test.each(CASES)("%s", (_label, plan) => {
    const size = modelSize(plan);
    expect(size.p).toBe(pByR(plan));
    expect(size.terms.reduce((s, t) => s + t.df, 0)).toBe(size.p);
  });

  test("barley by hand: 7 numeric terms + soil (4 levels) 3 + variety (4 levels) 3 = 13 (the demo model of lib/demo/)", () => {
    const size = modelSize(BARLEY_PLAN);
    expect(size.p).toBe(13);
    // df headroom = n − p − 1 (lib/readiness/CHECKS.md "The model: p, n and residual df"): the target df needs dfTarget + 14 complete cases
    expect(size.casesForTarget).toBe(size.dfTarget + 14);
  });
});
