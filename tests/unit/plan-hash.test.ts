/**
 * One plan hash: the engine's hashPlan (lib/readiness/check.ts: keys sorted, sha-256 through
 * Web Crypto) is what the app stores for every published plan and what the seed stores for
 * the demo's. The demo's own planHash (lib/demo/plan-hash.ts: canonical JSON through Node's
 * crypto) is an independent implementation the seed test checks stored hashes with; here the
 * two must agree on every demo plan, as parsed and stored.
 */
import { createHash } from "node:crypto";
import { describe, expect, it } from "vitest";
import { canonicalJson, DEMO_STUDIES, planHash } from "@/lib/demo";
import { hashPlan, parsePlan, type Plan } from "@/lib/readiness";

function parsed(input: unknown): Plan {
  const r = parsePlan(input);
  if (!r.ok) throw new Error(r.issues.map((i) => i.message).join("; "));
  return r.plan;
}

describe("the plan hash", () => {
  it.each(DEMO_STUDIES.map((s) => [s.slug, s.plan] as const))(
    "the engine and the demo hash %s alike",
    async (_slug, input) => {
      const plan = parsed(input);
      const engine = await hashPlan(plan);
      expect(engine).toMatch(/^[0-9a-f]{64}$/);
      expect(engine).toBe(planHash(plan));
      // and both are sha-256 of the key-sorted JSON text (FIPS 180-4 through Node's crypto)
      expect(engine).toBe(createHash("sha256").update(canonicalJson(plan)).digest("hex"));
    },
  );

  it("does not depend on key order, and changes with any value", async () => {
    const plan = parsed(DEMO_STUDIES[0]!.plan);
    const reordered = Object.fromEntries(Object.entries(plan).reverse()) as Plan;
    expect(await hashPlan(reordered)).toBe(await hashPlan(plan));
    const changed = { ...plan, intercept: !plan.intercept };
    expect(await hashPlan(changed)).not.toBe(await hashPlan(plan));
  });
});
