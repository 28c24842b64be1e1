/**
 * The plan editor's form state (components/plan-editor/form-state.ts): a stored plan loaded
 * into the form and sent back unchanged must be the same plan (same planHash), or the
 * "identical plan" refusal would never fire; typed text that is not a number is caught with
 * the plan path the server uses; server errors follow their row when rows move.
 */
import { describe, expect, test } from "vitest";
import { draftFromPlan, errorsByRow, planFromDraft } from "@/components/plan-editor/form-state";
import { BARLEY_PLAN, HEAT_PUMP_PLAN } from "@/lib/demo/plans";
import { planHash } from "@/lib/demo/plan-hash";
import { parsePlan, type PlanInput } from "@/lib/readiness";

function parsed(input: unknown) {
  const r = parsePlan(input);
  if (!r.ok) throw new Error(r.issues.map((i) => `${i.path}: ${i.message}`).join("; "));
  return r.plan;
}

describe("form state", () => {
  test.each([
    ["barley", BARLEY_PLAN],
    ["heat pump", HEAT_PUMP_PLAN],
  ] as const)(
    "the %s plan survives the round trip through the form with the same planHash",
    (_name, plan) => {
      const stored = parsed(plan);
      const { plan: back, errors } = planFromDraft(draftFromPlan(stored));
      expect(errors).toEqual({});
      expect(planHash(parsed(back))).toBe(planHash(stored));
    },
  );

  test("a changed level order is a different plan", () => {
    const stored = parsed(BARLEY_PLAN);
    const d = draftFromPlan(stored);
    const soil = d.columns.find((c) => c.name === "soil")!;
    soil.levels = [...soil.levels].reverse();
    expect(planHash(parsed(planFromDraft(d).plan))).not.toBe(planHash(stored));
  });

  test("text that is not a number is reported by plan path, and nothing half-parsed is sent", () => {
    const d = draftFromPlan(BARLEY_PLAN);
    const yieldIdx = d.columns.findIndex((c) => c.name === "yield_t_ha");
    d.columns[yieldIdx]!.min = "0,5";
    d.thresholds.vifWarning = "five";
    d.anticipatedR2 = "0.3";
    d.outcomeMean = "";
    d.outcomeSd = "1.2";
    const { plan, errors } = planFromDraft(d);
    expect(Object.keys(errors).sort()).toEqual([
      `columns.${yieldIdx}.min`,
      "outcome.mean",
      "thresholds.vifWarning",
    ]);
    expect(errors[`columns.${yieldIdx}.min`]?.[0]).toMatch(/decimal point/);
    expect(plan.columns[yieldIdx]?.min).toBeUndefined();
    expect(plan.anticipatedR2).toBe(0.3);
  });

  test("levels and baseline are dropped when a category becomes a number (the schema refuses them)", () => {
    const d = draftFromPlan(BARLEY_PLAN);
    const soil = d.columns.find((c) => c.name === "soil")!;
    soil.type = "number";
    const out = planFromDraft(d).plan.columns.find((c) => c.name === "soil");
    expect(out?.levels).toBeUndefined();
    expect(out?.baseline).toBeUndefined();
  });

  test("server errors keyed `columns.i.field` stay with their row when the rows are moved afterwards", () => {
    const d = draftFromPlan(BARLEY_PLAN as PlanInput);
    const before = d.columns;
    const mapped = errorsByRow(
      {
        "columns.8.baseline": ["bad baseline"],
        "columns.8.levels.2": ["blank level"],
        "columns.3": ["row problem"],
        "thresholds.vifWarning": ["too high"],
        columns: ["no response"],
      },
      before,
    );
    const soilKey = before[8]!.key;
    expect(mapped[`col:${soilKey}.baseline`]).toEqual(["bad baseline"]);
    expect(mapped[`col:${soilKey}.levels`]).toEqual(["blank level"]);
    expect(mapped[`col:${before[3]!.key}._row`]).toEqual(["row problem"]);
    expect(mapped["thresholds.vifWarning"]).toEqual(["too high"]);
    expect(mapped.columns).toEqual(["no response"]);
    // moving soil to the top does not move its errors to another column
    const moved = [before[8]!, ...before.filter((_, i) => i !== 8)];
    expect(mapped[`col:${moved[0]!.key}.baseline`]).toEqual(["bad baseline"]);
    expect(moved[8]!.name).toBe("total_water_mm");
    expect(mapped[`col:${moved[8]!.key}.baseline`]).toBeUndefined();
  });
});
