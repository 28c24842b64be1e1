/**
 * Missingness patterns are bounded (lib/readiness/state.ts patternLimit: 4,000,000 mask
 * characters, one per model column per pattern). A wide batch whose gaps fall in scattered
 * combinations — each incomplete row its own pattern — kept a mask per row before: 200,000 rows
 * × 101 model columns made a 22 MB state, over MariaDB's default 16 MB max_allowed_packet, so
 * such a report could not be stored. Past the limit the masks are dropped and the report says
 * so. Whether a file passes the limit does not depend on how it is cut into ranges or pooled:
 * one pass, 2–3 byte ranges and merged batch states agree.
 */
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import { afterAll, describe, expect, test } from "vitest";
import {
  checkBatch,
  mergeStates,
  parsePlan,
  type EngineState,
  type Plan,
  type ReadinessReport,
} from "@/lib/readiness";
import { buildDesign, predictorsOf } from "@/lib/readiness/design";
import { checkFile } from "@/lib/readiness/node";
import { patternLimit } from "@/lib/readiness/state";
import { chunks, rng } from "../fixtures/engine/data";
import { close } from "../helpers/close";

const P_COLS = 100; // predictors; with the response, 101 model columns
const LIMIT = patternLimit(P_COLS + 1);

function widePlan(): Plan {
  const cols = Array.from({ length: P_COLS }, (_, j) => `v${j}`);
  const p = parsePlan({
    columns: [
      { name: "id", role: "key", type: "text" },
      ...cols.map((name) => ({ name, role: "predictor" as const, type: "number" as const })),
      { name: "y", role: "response", type: "number" },
    ],
  });
  if (!p.ok) throw new Error(p.issues.map((i) => i.message).join("; "));
  return p.plan;
}

/** `rows` rows, each value missing with probability `gap` (from row `from` on: its ids). */
function wideFile(seed: number, rows: number, gap: number, from = 0): string {
  const r = rng(seed);
  const lines = ["id," + Array.from({ length: P_COLS }, (_, j) => `v${j}`).join(",") + ",y"];
  for (let i = 0; i < rows; i++) {
    const xs = Array.from({ length: P_COLS }, () => (r() < gap ? "" : (r() * 10).toFixed(2)));
    lines.push(`R${from + i},${xs.join(",")},${(r() * 5).toFixed(3)}`);
  }
  return lines.join("\n") + "\n";
}

const strip = ({ state: _s, timings: _t, ...rest }: ReadinessReport) => rest;
const stateOf = (r: ReadinessReport) => r.state as EngineState;
const plan = widePlan();
const dir = fs.mkdtempSync(path.join(os.tmpdir(), "tributary-patterns-"));
afterAll(() => fs.rmSync(dir, { recursive: true, force: true }));

async function bothWays(text: string, name: string): Promise<ReadinessReport> {
  const one = await checkBatch(chunks(text, 1 << 16), plan);
  const file = path.join(dir, name);
  fs.writeFileSync(file, text);
  for (const workers of [2, 3]) {
    const par = await checkFile(file, plan, { minBytes: 0, workers, inThread: true });
    close(strip(one), strip(par), `${name}, ${workers} ranges`);
    expect(stateOf(par).patterns).toEqual(stateOf(one).patterns);
  }
  return one;
}

describe("missingness patterns, bounded", () => {
  test("the limit for 101 model columns is 39,603 patterns (4,000,000 mask characters)", () => {
    expect(LIMIT).toBe(39_603);
    expect(patternLimit(12)).toBe(333_333);
  });

  test("scattered gaps past the limit: no masks kept, the report says so, one pass = byte ranges", async () => {
    // 44,000 rows with 20 % gaps: nearly every row its own pattern; each of two ranges holds
    // fewer than the limit, so the limit is passed only when the ranges are merged
    const one = await bothWays(wideFile(1, 44_000, 0.2), "scattered.csv");
    expect(one.missingness.patterns).toEqual([]);
    expect(one.missingness.patternsOverflow).toEqual({ limit: LIMIT });
    expect(stateOf(one).patterns).toMatchObject({ masks: [], overflowed: true });
    // the state no longer grows with the rows: 0.36 MB here, against about 4.7 MB of masks before
    expect(JSON.stringify(one.state).length).toBeLessThan(1_000_000);
    const note = one.findings.find((f) => f.code === "missing.pattern")!;
    expect(note.message).toContain("more than 39,603 different combinations of missing columns");
    expect(note.fix).toContain("missing counts of each column");
  }, 120_000);

  test("below the limit every pattern is kept, exactly", async () => {
    const one = await bothWays(wideFile(2, 30_000, 0.2), "below.csv");
    expect(one.missingness.patternsOverflow).toBeUndefined();
    const masks = stateOf(one).patterns.masks;
    expect(masks.length).toBeGreaterThan(29_000);
    expect(masks.length).toBeLessThanOrEqual(LIMIT);
    expect(masks.reduce((s, [, c]) => s + c, 0)).toBe(one.rows.total - one.rows.complete);
    expect(one.missingness.patterns.length).toBe(20);
  }, 120_000);

  test("pooled states past the limit together are past it, each alone is not", async () => {
    const a = stateOf(await checkBatch(chunks(wideFile(3, 25_000, 0.2)), plan));
    const b = stateOf(await checkBatch(chunks(wideFile(4, 25_000, 0.2, 25_000)), plan));
    for (const s of [a, b]) expect(s.patterns.overflowed).toBeUndefined();
    const designColumns = (levels: Record<string, string[]>) =>
      buildDesign(plan, predictorsOf(plan, levels), true).columns;
    const pooled = mergeStates([a, b], designColumns);
    expect(pooled.patterns).toMatchObject({ masks: [], overflowed: true });
    // a state past the limit keeps the pool past it
    const again = mergeStates([pooled, a], designColumns);
    expect(again.patterns.overflowed).toBe(true);
  }, 120_000);
});
