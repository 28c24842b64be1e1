/**
 * The catalogue of lib/readiness/CHECKS.md: each finding fires on a minimal invented file with its code and
 * severity (the defaults in its tables), with row numbers as a spreadsheet shows them
 * (header = row 1, so data row i is line i + 1), and does not fire on the clean file.
 */
import { describe, expect, test } from "vitest";
import { checkBatch, type Finding } from "@/lib/readiness";
import type { PlanInput } from "@/lib/readiness/plan";
import {
  HEADER,
  SOILS,
  VARIETIES,
  chunks,
  cleanRows,
  csvOf,
  plan,
  planInput,
  rng,
  type Row,
} from "../fixtures/engine/data";

const col = (name: string) => HEADER.indexOf(name);
const set = (rows: Row[], i: number, name: string, v: string | number) => {
  rows[i]![col(name)] = v;
  return rows;
};
const withColumn = (p: PlanInput, c: PlanInput["columns"][number]): Partial<PlanInput> => ({
  columns: [...p.columns, c],
});

interface Case {
  code: string;
  severity: Finding["severity"];
  n?: number;
  header?: (h: string[]) => string[];
  rows?: (r: Row[]) => Row[];
  plan?: Partial<PlanInput>;
  /** expected sample rows (spreadsheet lines) */
  lines?: number[];
  check?: (f: Finding, all: Finding[]) => void;
}

const base = planInput();

const cases: Case[] = [
  // Structure
  {
    code: "header.duplicate",
    severity: "blocker",
    header: (h) => [...h, "rainfall"],
    rows: (r) => r.map((x) => [...x, 1]),
  },
  {
    code: "header.blank",
    severity: "blocker",
    header: (h) => [...h, ""],
    rows: (r) => r.map((x) => [...x, ""]),
  },
  {
    code: "plan.column-missing",
    severity: "blocker",
    header: (h) => h.filter((x) => x !== "irrigation"),
    rows: (r) => r.map((x) => x.filter((_, j) => j !== col("irrigation"))),
    check: (f) => expect(f.columns).toEqual(["irrigation"]),
  },
  {
    code: "plan.column-unexpected",
    severity: "note",
    header: (h) => [...h, "notes"],
    rows: (r) => r.map((x) => [...x, "ok"]),
    check: (f) => expect(f.columns).toEqual(["notes"]),
  },
  { code: "row.ragged", severity: "blocker", rows: (r) => ((r[3] = [...r[3]!, "extra"]), r), lines: [5] },
  {
    code: "row.duplicate",
    severity: "warning",
    rows: (r) => [...r, [...r[4]!]],
    lines: [202],
    check: (f) => expect(f.detail?.pairs).toEqual([[202, 6]]),
  },
  { code: "key.duplicate", severity: "blocker", rows: (r) => set(r, 9, "plot_id", r[2]![0]!), lines: [11] },
  // Types and values
  {
    code: "type.mismatch",
    severity: "blocker",
    rows: (r) => set(set(r, 1, "nitrogen", "n/a"), 2, "nitrogen", "n/a"),
    lines: [3, 4],
    check: (f) => expect(f.detail?.offenders).toEqual([{ value: "n/a", count: 2 }]),
  },
  {
    code: "number.decimal-comma",
    severity: "blocker",
    rows: (r) => set(r, 6, "nitrogen", '"12,5"'),
    lines: [8],
  },
  {
    code: "number.sentinel",
    severity: "warning",
    rows: (r) => set(set(set(r, 3, "rainfall", -999), 8, "rainfall", -999), 20, "rainfall", -999),
    lines: [5, 10, 22],
    check: (f) => expect(f.detail).toMatchObject({ value: -999, declared: false }),
  },
  {
    code: "number.sentinel",
    severity: "warning",
    rows: (r) => set(r, 3, "rainfall", -999),
    plan: { columns: base.columns.map((c) => (c.name === "rainfall" ? { ...c, sentinels: [-999] } : c)) },
    lines: [5],
    check: (f) => expect(f.detail).toMatchObject({ value: -999, declared: true }),
  },
  {
    code: "value.out-of-range",
    severity: "blocker",
    rows: (r) => set(r, 4, "nitrogen", 900),
    lines: [6],
    check: (f) => expect(f.detail?.examples).toEqual([900]),
  },
  {
    code: "date.ambiguous",
    severity: "warning",
    rows: (r) =>
      r.map((x, i) => ((x[col("sow_date")] = `${String(1 + (i % 12)).padStart(2, "0")}/04/2026`), x)),
    check: (f) => expect(f.rowCount).toBeGreaterThan(150),
  },
  // Categories
  { code: "level.unknown", severity: "blocker", rows: (r) => set(r, 3, "soil", "peat"), lines: [5] },
  {
    code: "level.variant",
    severity: "warning",
    rows: (r) => set(set(r, 5, "soil", "Clay"), 9, "soil", "clay "),
    lines: [7, 11],
    check: (f) =>
      expect(f.detail?.merges).toEqual([
        { from: "Clay", to: "clay", count: 1 },
        { from: "clay ", to: "clay", count: 1 },
      ]),
  },
  // rows 3, 7, 11, 15, 19 keep "silt": 5 complete rows, below the default of 10
  {
    code: "level.sparse",
    severity: "warning",
    rows: (r) => r.map((x, i) => (x[col("soil")] === "silt" && i > 20 ? ((x[col("soil")] = "loam"), x) : x)),
    check: (f) => expect(f.detail?.levels).toEqual([{ level: "silt", complete: 5 }]),
  },
  { code: "level.single", severity: "blocker", rows: (r) => r.map((x) => ((x[col("soil")] = "loam"), x)) },
  {
    code: "level.too-many",
    severity: "warning",
    header: (h) => [...h, "field"],
    rows: (r) => r.map((x, i) => [...x, `f${i % 60}`]),
    plan: withColumn(base, { name: "field", role: "carry", type: "category", openLevels: true }),
  },
  {
    code: "level.baseline-absent",
    severity: "warning",
    rows: (r) => r.map((x) => (x[col("soil")] === "silt" ? ((x[col("soil")] = "loam"), x) : x)),
    plan: { columns: base.columns.map((c) => (c.name === "soil" ? { ...c, baseline: "silt" } : c)) },
  },
  // Missingness
  {
    code: "missing.column",
    severity: "note",
    rows: (r) => [1, 2, 3].reduce((a, i) => set(a, i, "irrigation", ""), r),
    lines: [3, 4, 5],
  },
  {
    code: "missing.column",
    severity: "warning",
    rows: (r) => r.map((x, i) => (i % 6 === 0 ? ((x[col("irrigation")] = "NA"), x) : x)),
  },
  {
    code: "missing.column",
    severity: "blocker",
    rows: (r) => r.map((x, i) => (i % 2 === 0 ? ((x[col("irrigation")] = ""), x) : x)),
  },
  {
    code: "missing.response",
    severity: "warning",
    rows: (r) => set(set(r, 7, "yield", ""), 8, "yield", "NA"),
    lines: [9, 10],
  },
  {
    code: "missing.complete-cases",
    severity: "note",
    rows: (r) =>
      r.map(
        (x, i) => (i % 10 === 0 && (x[col("irrigation")] = ""), i % 50 === 1 && (x[col("rainfall")] = ""), x),
      ),
    check: (f) => {
      expect(f.columns).toEqual(["irrigation"]);
      expect(f.detail).toMatchObject({ complete: 176, total: 200 });
    },
  },
  {
    code: "missing.pattern",
    severity: "note",
    rows: (r) =>
      r.map((x, i) => (i % 10 === 0 && ((x[col("irrigation")] = ""), (x[col("rainfall")] = "")), x)),
    check: (f) => expect(f.detail?.patterns).toEqual([{ columns: ["irrigation", "rainfall"], count: 20 }]),
  },
  {
    // irrigation goes missing where the yield is high: not MCAR (Little 1988)
    code: "missing.not-at-random-hint",
    severity: "note",
    rows: (r) => r.map((x) => (Number(x[col("yield")]) > 4.2 ? ((x[col("irrigation")] = ""), x) : x)),
    check: (f) => expect((f.detail as { pValue: number }).pValue).toBeLessThan(0.05),
  },
  // Collinearity
  {
    code: "collinear.exact",
    severity: "blocker",
    header: (h) => [...h, "total_water"],
    rows: (r) =>
      r.map((x) => [...x, +(Number(x[col("irrigation")]) + Number(x[col("rainfall")])).toFixed(1)]),
    plan: withColumn(base, { name: "total_water", role: "predictor", type: "number" }),
    check: (f) => expect(f.message).toMatch(/total_water = irrigation \+ rainfall/),
  },
  ...["collinear.pair", "collinear.vif"].map((code): Case => ({
    code,
    severity: "warning",
    header: (h) => [...h, "irrigation_gauge"],
    rows: (r) => {
      const g = rng(7);
      return r.map((x) => [...x, +(Number(x[col("irrigation")]) + (g() - 0.5) * 8).toFixed(2)]);
    },
    plan: withColumn(base, { name: "irrigation_gauge", role: "predictor", type: "number" }),
  })),
  {
    code: "collinear.gvif",
    severity: "warning",
    rows: (r) =>
      r.map(
        (x, i) => (
          (x[col("variety")] =
            i % 25 === 0 ? VARIETIES[(i / 25) % 3]! : VARIETIES[SOILS.indexOf(String(x[col("soil")])) % 3]!),
          x
        ),
      ),
    check: (f) => expect(f.columns[0]).toMatch(/soil|variety/),
  },
  {
    code: "collinear.condition",
    severity: "warning",
    header: (h) => [...h, "elevation"],
    rows: (r) => {
      const g = rng(11);
      return r.map((x) => [...x, (1000 + g() * 0.5).toFixed(3)]);
    },
    plan: withColumn(base, { name: "elevation", role: "predictor", type: "number" }),
    check: (f) => expect(f.columns).toEqual(expect.arrayContaining(["intercept", "elevation"])),
  },
  // Sample size and degrees of freedom
  { code: "df.none", severity: "blocker", n: 6 },
  {
    code: "df.low",
    severity: "blocker",
    n: 15,
    check: (f) => expect(f.detail).toMatchObject({ n: 15, p: 8, residualDf: 6 }),
  },
  { code: "df.per-parameter", severity: "warning", n: 60, check: (f) => expect(f.detail?.ratio).toBe(7.5) },
  // Green 1991: 50 + 8·8 = 114 > 100
  {
    code: "df.green",
    severity: "note",
    n: 100,
    check: (f) => expect(f.detail).toMatchObject({ overall: 114, individual: 112 }),
  },
  { code: "df.riley", severity: "warning", plan: { anticipatedR2: 0.2 } },
  {
    code: "df.selection-budget",
    severity: "warning",
    plan: { selection: { candidates: 40 } },
    check: (f) => expect(f.message).toMatch(/2\^40 ≈ 1\.1e\+12/),
  },
  { code: "df.power", severity: "note" },
];

async function run(c: Pick<Case, "n" | "header" | "rows" | "plan">) {
  const rows = (c.rows ?? ((r) => r))(cleanRows(c.n ?? 200));
  const header = (c.header ?? ((h) => h))([...HEADER]);
  return checkBatch(chunks(csvOf(header, rows), 1000), plan(c.plan ?? {}));
}

describe("each catalogue finding fires on a minimal file", () => {
  test.each(cases.map((c) => [`${c.code} (${c.severity})`, c] as const))("%s", async (_name, c) => {
    const r = await run(c);
    const found = r.findings.filter((f) => f.code === c.code && f.severity === c.severity);
    expect(found.length, JSON.stringify(r.findings.map((f) => [f.code, f.severity]))).toBeGreaterThan(0);
    const f = found[0]!;
    expect(f.fix.length).toBeGreaterThan(10);
    if (c.lines) expect(f.rows).toEqual(c.lines);
    c.check?.(f, r.findings);
  });
});

describe("the clean file", () => {
  test("has no finding but the informational power note", async () => {
    const r = await run({});
    expect(r.status).toBe("checked");
    expect(r.findings.map((f) => f.code)).toEqual(["df.power"]);
    expect(r.counts).toEqual({ blocker: 0, warning: 0, note: 1 });
  });
});

describe("row evidence is capped at thresholds.sampleRows with the full count", () => {
  test("type.mismatch on 50 rows keeps 20 sample rows and rowCount 50", async () => {
    const r = await run({
      rows: (rows) => rows.map((x, i) => (i < 50 ? ((x[col("nitrogen")] = "x"), x) : x)),
    });
    const f = r.findings.find((x) => x.code === "type.mismatch")!;
    expect(f.rows).toEqual(Array.from({ length: 20 }, (_, i) => i + 2));
    expect(f.rowCount).toBe(50);
  });
});
