/**
 * Rows at fault (lib/readiness/faults.ts) on the demo batches and invented files: every
 * sample row of a row-level finding comes back with that code, a clean file yields nothing,
 * line numbers follow quoted line breaks, and an unreadable file throws as the check says.
 * Also the missing.column grading by role, level.variant targets and distinct sample rows.
 */
import { describe, expect, test } from "vitest";
import {
  checkBatch,
  parsePlan,
  rowsAtFault,
  ROW_FAULT_CODES,
  UnreadableError,
  type EngineState,
  type FaultLine,
  type Plan,
  type ReadinessReport,
} from "@/lib/readiness";
import { barleyBatches } from "@/lib/demo/batches";
import { BARLEY_PLAN } from "@/lib/demo/plans";
import { HEADER, chunks, cleanRows, csvOf, plan as testPlan, planInput } from "../fixtures/engine/data";

const barley = (() => {
  const p = parsePlan(BARLEY_PLAN);
  if (!p.ok) throw new Error("demo plan invalid");
  return p.plan;
})();
const demo = (slug: string) => barleyBatches().find((b) => b.organisationSlug === slug)!.csv;

async function faultsOf(
  csv: string,
  plan: Plan,
  chunk = 977,
): Promise<{ report: ReadinessReport; items: FaultLine[] }> {
  const report = await checkBatch(chunks(csv, chunk), plan);
  const items: FaultLine[] = [];
  for await (const it of rowsAtFault(chunks(csv, chunk), plan, { report })) items.push(it);
  return { report, items };
}

/** the row-level findings' sample rows must come back, each with a fault of that code on that column */
function expectSamplesCovered(report: ReadinessReport, items: FaultLine[], plan: Plan) {
  const byLine = new Map(items.filter((i) => i.kind === "row").map((i) => [i.line, i]));
  const graded = new Set(
    plan.columns
      .filter((c) => c.role === "response" || c.role === "predictor" || c.role === "key")
      .map((c) => c.name),
  );
  let checked = 0;
  for (const f of report.findings) {
    if (!(ROW_FAULT_CODES as readonly string[]).includes(f.code)) continue;
    // a carried column's gaps are a note about the column, not a fault of the row
    if (f.code === "missing.column" && !graded.has(f.columns[0]!)) continue;
    for (const line of f.rows) {
      const item = byLine.get(line);
      expect(item, `${f.code} row ${line}`).toBeDefined();
      const col = f.columns[0] ?? null;
      const codes =
        f.code === "missing.column" && plan.columns.find((c) => c.name === col)?.role === "response"
          ? ["missing.column", "missing.response"]
          : [f.code];
      expect(
        item!.faults.some((x) => codes.includes(x.code) && (col === null || x.column === col)),
        `${f.code} on ${col} at row ${line}`,
      ).toBe(true);
      checked++;
    }
  }
  return checked;
}

describe("rowsAtFault on the demo batches", () => {
  test("Fennick Hill: the soil variants' rows, each with level.variant and the merge target", async () => {
    const { report, items } = await faultsOf(demo("fennick-hill"), barley);
    expect(items[0]!.kind).toBe("header");
    expect(items[0]!.fields).toEqual((report.state as EngineState).header);
    const rows = items.slice(1);
    // the generator writes “Clay” or “clay ” on two of every three clay plots (lib/demo/batches.ts)
    const variant = report.findings.find((f) => f.code === "level.variant")!;
    expect(rows.length).toBe(variant.rowCount);
    expect(expectSamplesCovered(report, items, barley)).toBeGreaterThan(20);
    const soil = (report.state as EngineState).header.indexOf("soil");
    for (const r of rows) {
      expect(["Clay", "clay "]).toContain(r.fields[soil]);
      expect(r.faults.find((f) => f.code === "level.variant")!.message).toMatch(/write “clay”/);
    }
    expect(rows.map((r) => r.line)).toEqual([...rows.map((r) => r.line)].sort((a, b) => a - b));
  });

  test("Saltmarsh End: decimal commas and the -999 plant densities", async () => {
    const { report, items } = await faultsOf(demo("saltmarsh-end"), barley);
    expect(expectSamplesCovered(report, items, barley)).toBeGreaterThan(80);
    const sentinel = items.filter((i) => i.faults.some((f) => f.code === "number.sentinel"));
    // every 11th plot from the 5th has -999 (lib/demo/batches.ts): data rows 5, 16, … → lines 6, 17, …
    expect(sentinel.map((i) => i.line)).toEqual(Array.from({ length: 13 }, (_, k) => 6 + 11 * k));
    const density = (report.state as EngineState).header.indexOf("plant_density");
    for (const i of sentinel) expect(i.fields[density]).toBe("-999");
    // the rows with commas: every row where some number has a decimal part
    const comma = report.findings.filter((f) => f.code === "number.decimal-comma");
    const most = Math.max(...comma.map((f) => f.rowCount ?? 0));
    expect(
      items.filter((i) => i.faults.some((f) => f.code === "number.decimal-comma")).length,
    ).toBeGreaterThanOrEqual(most);
  });

  test("clean demo batches yield nothing and are no longer held up by the empty notes column", async () => {
    for (const slug of ["harrowgate", "coldwell"]) {
      const { report, items } = await faultsOf(demo(slug), barley);
      expect(items).toEqual([]);
      const note = report.findings.find(
        (f) => f.code === "missing.column" && f.columns[0] === "farm_plot_note",
      )!;
      expect(note.severity).toBe("note");
      expect(note.message).toMatch(/carried along/);
      expect(report.counts.blocker).toBe(0);
    }
  });
});

describe("rowsAtFault on invented files", () => {
  const p = testPlan();

  test("line numbers follow quoted line breaks; faults by column; duplicates and keys", async () => {
    const rows = cleanRows(40);
    const farm = HEADER.indexOf("farm");
    rows[3]![farm] = '"two\nlines"';
    rows[5]![farm] = '"three\nline\nnote"';
    rows[6]![HEADER.indexOf("nitrogen")] = "lots"; // data row 7, after 1 + 2 extra lines → line 11
    rows[9] = [...rows[2]!]; // exact repeat of data row 3 (line 4), at data row 10 → line 14
    rows[12]![0] = rows[1]![0]!; // key of data row 2 (line 3) again at data row 13 → line 17
    rows[14]![HEADER.indexOf("yield")] = ""; // line 19
    const { report, items } = await faultsOf(csvOf(HEADER, rows), p, 61);
    expect(expectSamplesCovered(report, items, p)).toBeGreaterThanOrEqual(4);
    const at = (line: number) => items.find((i) => i.line === line && i.kind === "row");
    expect(at(11)!.faults).toEqual([
      { code: "type.mismatch", column: "nitrogen", message: "“lots” is not a number." },
    ]);
    expect(at(11)!.fields[farm]).toBe(String(rows[6]![farm]));
    expect(at(14)!.faults.map((f) => f.code)).toContain("row.duplicate");
    expect(at(14)!.faults.find((f) => f.code === "row.duplicate")!.message).toBe(
      "This row repeats row 4 exactly.",
    );
    expect(at(17)!.faults.find((f) => f.code === "key.duplicate")!.message).toMatch(/already used on row 3/);
    expect(at(19)!.faults.map((f) => f.code)).toEqual(["missing.response"]);
    expect(items.filter((i) => i.kind === "row").map((i) => i.line)).toEqual([11, 14, 17, 19]);
    // the quoted notes themselves are fine
    expect(at(5)).toBeUndefined();
  });

  test("ragged rows come back with the fields as read; a clean file yields nothing", async () => {
    const rows = cleanRows(30);
    rows[4] = [...rows[4]!, "extra"];
    const { items } = await faultsOf(csvOf(HEADER, rows), p);
    expect(items.map((i) => [i.kind, i.line])).toEqual([
      ["header", 1],
      ["row", 6],
    ]);
    expect(items[1]!.fields.length).toBe(HEADER.length + 1);
    expect(items[1]!.faults[0]!.code).toBe("row.ragged");
    expect((await faultsOf(csvOf(HEADER, cleanRows(30)), p)).items).toEqual([]);
  });

  test("unreadable files throw the check's UnreadableError; a report of another plan is refused", async () => {
    const zip = new Uint8Array([0x50, 0x4b, 0x03, 0x04, 0, 0, 0, 0, 1, 2, 3]);
    const report = await checkBatch(chunks(zip), p);
    expect(report.status).toBe("unreadable");
    const run = async () => {
      for await (const _ of rowsAtFault(chunks(zip), p, { report })) void _;
    };
    await expect(run()).rejects.toBeInstanceOf(UnreadableError);
    const csv = csvOf(HEADER, cleanRows(20));
    const other = testPlan({ missingTokens: ["", "NA", "-"] });
    const r2 = await checkBatch(chunks(csv), other);
    const wrong = async () => {
      for await (const _ of rowsAtFault(chunks(csv), p, { report: r2 })) void _;
    };
    await expect(wrong()).rejects.toThrow(/different data plan/);
  });

  test("without a report, an opener is read twice; a bare stream is refused", async () => {
    const rows = cleanRows(30);
    rows[2]![HEADER.indexOf("soil")] = "peat";
    const csv = csvOf(HEADER, rows);
    const items: FaultLine[] = [];
    for await (const it of rowsAtFault(() => chunks(csv), p)) items.push(it);
    expect(items.map((i) => i.line)).toEqual([1, 4]);
    expect(items[1]!.faults.map((f) => f.code)).toEqual(["level.unknown"]);
    const bare = async () => {
      for await (const _ of rowsAtFault(chunks(csv), p)) void _;
    };
    await expect(bare()).rejects.toThrow(/report/);
  });

  test("a consumer that stops early leaves no reading behind", async () => {
    const rows = cleanRows(5000);
    for (const r of rows) r[HEADER.indexOf("nitrogen")] = "x";
    const csv = csvOf(HEADER, rows);
    const report = await checkBatch(chunks(csv), p);
    let n = 0;
    for await (const it of rowsAtFault(chunks(csv, 4096), p, { report }))
      if (it.kind === "row" && ++n === 3) break;
    expect(n).toBe(3);
    // and a full read gives every row (more than the 2,000 held before the reader pauses)
    let all = 0;
    for await (const it of rowsAtFault(chunks(csv, 4096), p, { report })) if (it.kind === "row") all++;
    expect(all).toBe(5000);
  });
});

describe("missingness by role, variant targets, distinct sample rows", () => {
  test("missing.column: graded for model and key columns, at most a note for carry, nothing for ignore", async () => {
    const rows = cleanRows(100).map((r, i) => {
      if (i % 2 === 0) r[HEADER.indexOf("farm")] = ""; // carry, 50 % empty
      if (i % 2 === 0) r[HEADER.indexOf("sow_date")] = ""; // ignored below
      if (i % 2 === 0) r[HEADER.indexOf("irrigation")] = ""; // predictor, 50 % empty
      return r;
    });
    const p = testPlan({
      columns: planInput().columns.map((c) =>
        c.name === "sow_date" ? { ...c, role: "ignore" as const } : c,
      ),
    });
    const r = await checkBatch(chunks(csvOf(HEADER, rows)), p);
    const m = (name: string) => r.findings.find((f) => f.code === "missing.column" && f.columns[0] === name);
    // lib/readiness/CHECKS.md missing.column: blocker at ≥ 40 % for the planned model's columns
    expect(m("irrigation")!.severity).toBe("blocker");
    expect(m("farm")!.severity).toBe("note");
    expect(m("sow_date")).toBeUndefined();
  });

  test("level.variant: closed lists merge onto plan levels only, one proposal per variant", async () => {
    const rows = cleanRows(200);
    const soil = HEADER.indexOf("soil");
    rows[3]![soil] = "Clay";
    rows[7]![soil] = "Clay";
    rows[11]![soil] = "clay ";
    rows[15]![soil] = "Cláy";
    rows[19]![soil] = "Peaty"; // unknown, and near only the unknown “Peat”: no merge between two variants
    rows[23]![soil] = "Peat";
    const r = await checkBatch(chunks(csvOf(HEADER, rows)), testPlan());
    const v = r.findings.find((f) => f.code === "level.variant")!;
    expect(v.detail?.merges).toEqual([
      { from: "Clay", to: "clay", count: 2 },
      { from: "clay ", to: "clay", count: 1 },
      { from: "Cláy", to: "clay", count: 1 },
    ]);
    expect(v.rows).toEqual([5, 9, 13, 17]);
    expect(v.rowCount).toBe(4);
  });

  test("level.variant: an open list merges onto the most frequent spelling", async () => {
    const rows = cleanRows(200);
    const farm = HEADER.indexOf("farm");
    rows.forEach(
      (r, i) => (r[farm] = i % 10 === 0 ? "Harrowgate" : i % 25 === 1 ? "harrowgate " : "harrowgate"),
    );
    const p = testPlan({
      columns: planInput().columns.map((c) =>
        c.name === "farm"
          ? { name: "farm", role: "carry" as const, type: "category" as const, openLevels: true }
          : c,
      ),
    });
    const r = await checkBatch(chunks(csvOf(HEADER, rows)), p);
    const v = r.findings.find((f) => f.code === "level.variant")!;
    expect(v.detail?.merges).toEqual([
      { from: "Harrowgate", to: "harrowgate", count: 20 },
      { from: "harrowgate ", to: "harrowgate", count: 8 },
    ]);
  });

  test("every finding's sample rows are distinct and ascending", async () => {
    for (const b of barleyBatches()) {
      const r = await checkBatch(chunks(b.csv, 4096), barley);
      for (const f of r.findings) {
        expect(f.rows, f.code).toEqual([...new Set(f.rows)].sort((a, b) => a - b));
        if (f.rowCount !== undefined) expect(f.rowCount).toBeGreaterThanOrEqual(f.rows.length);
      }
    }
  });
});
