/**
 * The plan's selection lists (candidate terms by name, a bare count for older plans, required
 * terms), the df budget they give, and the pool questions' answers to bad or thin input: an
 * empty pool, a value that is not an engine state, a pool of one batch. Expected values follow
 * from the definitions (2^m subsets for m terms; a category's indicator columns each count).
 */
import { describe, expect, it } from "vitest";
import { checkBatch, parsePlan, poolQuestions, type PlanInput } from "@/lib/readiness";
import { makePool } from "../fixtures/pool/data";
import { draftFromPlan, planFromDraft } from "@/components/plan-editor/form-state";

const base: PlanInput = {
  columns: [
    { name: "x1", role: "predictor", type: "number" },
    { name: "x2", role: "predictor", type: "number" },
    { name: "f1", role: "predictor", type: "category", levels: ["a", "b", "c"] },
    { name: "y", role: "response", type: "number" },
  ],
  interactions: [["x1", "f1"]],
};

describe("selection lists in the plan", () => {
  it("accepts term names, interactions and required terms, and a bare count", () => {
    const named = parsePlan({ ...base, selection: { candidates: ["x2", "f1", "x1:f1"], required: ["x1"] } });
    expect(named.ok).toBe(true);
    if (named.ok)
      expect(named.plan.selection).toEqual({ candidates: ["x2", "f1", "x1:f1"], required: ["x1"] });
    const count = parsePlan({ ...base, selection: { candidates: 12 } });
    expect(count.ok).toBe(true);
    if (count.ok) expect(count.plan.selection).toEqual({ candidates: 12 });
  });

  it("says which name is not a planned term, which is listed twice, and which is in both lists", () => {
    const r = parsePlan({ ...base, selection: { candidates: ["x2", "x3", "x2"], required: ["f1", "x2"] } });
    expect(r.ok).toBe(false);
    if (r.ok) return;
    const byPath = Object.fromEntries(r.issues.map((i) => [i.path, i.message]));
    expect(byPath["selection.candidates.1"]).toMatch(
      /"x3" is not a planned predictor or interaction \(x1, x2, f1, x1:f1\)/,
    );
    expect(byPath["selection.candidates.2"]).toMatch(/"x2" is listed twice/);
    expect(byPath["selection.required.1"]).toMatch(/"x2" is both a candidate and a required term/);
  });

  it.each([
    { candidates: ["x2", "f1", "x1:f1"], required: ["x1"] },
    { candidates: ["x2", "f1"] },
    { candidates: 7 },
  ])("the plan editor gives the same selection back (%j)", (selection) => {
    const p = parsePlan({ ...base, selection });
    if (!p.ok) throw new Error(JSON.stringify(p.issues));
    const back = planFromDraft(draftFromPlan(p.plan));
    expect(back.errors).toEqual({});
    const again = parsePlan(back.plan);
    expect(again.ok && again.plan.selection).toEqual(p.plan.selection);
  });

  it("the df budget counts a category's indicator columns and 2^m subsets of m terms", async () => {
    const p = parsePlan({ ...base, interactions: [], selection: { candidates: ["x2", "f1"] } });
    if (!p.ok) throw new Error(JSON.stringify(p.issues));
    const text =
      "x1,x2,f1,y\n" +
      Array.from(
        { length: 30 },
        (_, i) => `${i},${(i * 7) % 11},${"abc"[i % 3]},${i * 0.5 + ((i * 3) % 5)}`,
      ).join("\n") +
      "\n";
    const report = await checkBatch(
      (async function* () {
        yield new TextEncoder().encode(text);
      })(),
      p.plan,
    );
    // x2: 1 column; f1 with baseline a: f1[b], f1[c]
    expect(report.sampleSize?.selection).toEqual({ candidates: 3, subsets: 4 });
  });
});

describe("pool questions on bad or thin input", () => {
  it("an empty pool and a value that is not an engine state get a plain message", async () => {
    const pool = await makePool({ numeric: 2, sizes: [30], seed: 1 });
    expect(() => poolQuestions([], pool.plan)).toThrow(/no accepted batches yet; accept a batch/);
    const bad = { ...pool.members[0]!, label: "North field v2", state: { kind: "something else" } as never };
    expect(() => poolQuestions([bad], pool.plan)).toThrow(
      /batch North field v2 has no engine state; check it again/,
    );
  });

  it("a pool of one batch: the overall test, no poolability or influence rows, no cross-validation", async () => {
    const pool = await makePool({
      numeric: 3,
      sizes: [40],
      seed: 2,
      selection: { candidates: ["x1", "x2", "x3"] },
    });
    const q = poolQuestions(pool.members, pool.plan);
    expect(q.n).toBe(40);
    expect(q.overall!.df1).toBe(3);
    expect(q.overall!.df2).toBe(36);
    expect(q.poolability.whole).toBeNull();
    expect(q.poolability.batches).toEqual([]);
    expect(q.influence.batches).toEqual([]);
    expect(q.selection!.lobo).toBeNull();
    expect(q.selection!.bySize.length).toBe(4);
    expect(q.caution).toMatch(/Selection on the same data overstates the fit/);
  });

  it("a batch without complete rows is said so and changes no other figure", async () => {
    const pool = await makePool({
      numeric: 2,
      sizes: [40, 35, 30],
      seed: 4,
      selection: { candidates: ["x1", "x2"] },
    });
    const report = await checkBatch(
      (async function* () {
        yield new TextEncoder().encode("x1,x2,y\n1,2,NA\n3,,4\n");
      })(),
      pool.plan,
    );
    const empty = { id: "e", label: "batch e", group: "e", groupLabel: "e", state: report.state as never };
    const withEmpty = poolQuestions([...pool.members, empty], pool.plan);
    const without = poolQuestions(pool.members, pool.plan);
    const row = withEmpty.poolability.batches.find((b) => b.id === "e")!;
    expect(row.n).toBe(0);
    expect(row.F).toBeNull();
    expect(row.words).toMatch(/batch e has no complete rows/);
    expect(withEmpty.poolability.whole!.groups).toBe(3);
    expect(withEmpty.poolability.whole!.F).toBeCloseTo(without.poolability.whole!.F!, 10);
    expect(withEmpty.selection!.lobo!.folds).toBe(3);
    expect(withEmpty.selection!.lobo!.mspe).toEqual(without.selection!.lobo!.mspe);
  });

  it("a plan that only counts candidates has no selection preview", async () => {
    const pool = await makePool({ numeric: 2, sizes: [30, 30], seed: 3, selection: { candidates: 4 } });
    expect(poolQuestions(pool.members, pool.plan).selection).toBeNull();
  });
});
