/**
 * Fix proposals and the byte-faithful corrected file (lib/readiness/fixes, CHECKS.md "Fix
 * proposals"): applied proposals resolve their findings and add none, the row count stays; only
 * the cells a proposal covers change, byte for byte against an expected file built from the
 * generator's own raw pieces, and the change log lists exactly those cells; what is not certain
 * (an ambiguous date order, a column mixing decimal comma and point, a suspected sentinel) is
 * left alone. ISO 8601 (YYYY-MM-DD) is the target date form; RFC 4180 the quoting rule.
 */
import { describe, expect, test } from "vitest";
import {
  FIX_CODES,
  applyFixes,
  applyFixesToBytes,
  changeLogCsv,
  checkBatch,
  proposeFixes,
  selectProposals,
  type FixChange,
  type FixProposal,
  type Plan,
  type ReadinessReport,
} from "@/lib/readiness";
import { HEADER, chunks, cleanRows, plan, rng, SOILS, type Row } from "../fixtures/engine/data";

const enc = new TextEncoder();
const dec = new TextDecoder("utf-8", { ignoreBOM: true });

async function checked(
  text: string | Uint8Array,
  p: Plan,
): Promise<{ report: ReadinessReport; proposals: FixProposal[] }> {
  const report = await checkBatch(chunks(text, 977), p);
  const proposals = await proposeFixes(chunks(text, 977), p, report);
  return { report, proposals };
}

const keyOf = (f: { code: string; columns: string[] }) => `${f.code}|${f.columns.join(",")}`;

/** A batch with the mechanical faults of the cells: variants of clay, decimal commas, a declared sentinel, NA, d/m/y dates. */
function faultyBatch(n = 160, rename = false): { text: string; plan: Plan } {
  const rows = cleanRows(n, 7);
  const out = rows.map((r, i) => {
    const row: Row = [...r];
    if (row[2] === "clay") row[2] = i % 3 === 0 ? "Clay" : i % 3 === 1 ? "clay " : "clay";
    row[8] = String(row[8]).replace(".", ",");
    if (i % 17 === 5) row[6] = -999;
    if (i % 13 === 2) row[1] = "NA";
    const day = String(row[7]).slice(8, 10);
    row[7] = `${+day}/4/2026`;
    return row;
  });
  const header = HEADER.map((h) => (h === "nitrogen" && rename ? "Nitrogen" : h));
  // a decimal-comma export: semicolons between the fields
  const text = [header.join(";"), ...out.map((r) => r.join(";"))].join("\r\n") + "\r\n";
  const p = plan();
  p.columns.find((c) => c.name === "rainfall")!.sentinels = [-999];
  return { text, plan: p };
}

describe("proposals", () => {
  test("each mechanical finding gets a counted proposal with examples", async () => {
    const { text, plan: p } = faultyBatch(160, true);
    const { report, proposals } = await checked(text, p);
    const ids = proposals.map((x) => x.id).sort();
    expect(ids).toEqual([
      "date.iso:sow_date",
      "header.rename:nitrogen",
      "level.variant:soil",
      "missing.token:farm",
      "number.decimal-comma:yield",
      "number.sentinel:rainfall",
    ]);
    const level = proposals.find((x) => x.code === "level.variant")!;
    const variant = report.findings.find((f) => f.code === "level.variant")!;
    expect(level.cells).toBe(variant.rowCount);
    expect(level.resolves).toEqual(["level.variant", "level.unknown"]);
    expect(level.examples.map((e) => [e.before, e.after]).sort()).toEqual([
      ["Clay", "clay"],
      ["clay ", "clay"],
    ]);
    const comma = proposals.find((x) => x.code === "number.decimal-comma")!;
    expect(comma.cells).toBe(report.findings.find((f) => f.code === "number.decimal-comma")!.rowCount);
    expect(comma.examples[0]!.after).toBe(comma.examples[0]!.before.replace(",", "."));
    const sentinel = proposals.find((x) => x.code === "number.sentinel")!;
    expect(sentinel.cells).toBe(Math.ceil((160 - 5) / 17));
    expect(sentinel.examples[0]).toMatchObject({ before: "-999", after: "" });
    const rename = proposals.find((x) => x.code === "header.rename")!;
    expect(rename.examples).toEqual([{ row: 1, before: "Nitrogen", after: "nitrogen" }]);
    const date = proposals.find((x) => x.code === "date.iso")!;
    expect(date.cells).toBe(160);
    const ex = date.examples[0]!;
    const [d, m, y] = ex.before.split("/");
    expect(ex.after).toBe(`${y}-${m!.padStart(2, "0")}-${d!.padStart(2, "0")}`);
  });

  test("the corrected file's report has the applied findings resolved, no new ones, the same rows", async () => {
    const { text, plan: p } = faultyBatch();
    const { report, proposals } = await checked(text, p);
    const fixed = await applyFixesToBytes(enc.encode(text), proposals);
    const after = await checkBatch(chunks(fixed.bytes, 1013), p);
    expect(after.rows.total).toBe(report.rows.total);
    const resolved = new Set(proposals.flatMap((x) => x.resolves.map((code) => `${code}|${x.column}`)));
    expect([...resolved].sort()).toEqual([
      "level.unknown|soil",
      "level.variant|soil",
      "number.decimal-comma|yield",
      "number.sentinel|rainfall",
    ]);
    for (const f of after.findings) {
      expect(resolved.has(`${f.code}|${f.columns.join(",")}`), `${f.code} still there`).toBe(false);
      expect(
        report.findings.map((b) => b.code),
        `new finding ${keyOf(f)}`,
      ).toContain(f.code);
    }
    expect(await proposeFixes(chunks(fixed.bytes), p, after)).toEqual([]);
    // each proposal alone changes exactly the cells it counted
    for (const x of proposals) {
      const one = await applyFixesToBytes(enc.encode(text), [x]);
      expect(one.changes.length, x.id).toBe(x.cells);
      expect(new Set(one.changes.map((c) => c.proposal))).toEqual(new Set([x.id]));
    }
  });

  test("a header one letter off is renamed: the column is found, nothing else changes", async () => {
    const rows = cleanRows(400, 9);
    const header = HEADER.map((h) => (h === "rainfall" ? "rainfal" : h));
    const text = [header.join(","), ...rows.map((r) => r.join(","))].join("\n") + "\n";
    const p = plan();
    const { report, proposals } = await checked(text, p);
    expect(report.findings.map(keyOf)).toEqual(
      expect.arrayContaining(["plan.column-missing|rainfall", "plan.column-unexpected|rainfal"]),
    );
    expect(proposals.map((x) => [x.id, x.cells, x.resolves])).toEqual([
      ["header.rename:rainfall", 1, ["plan.column-missing"]],
    ]);
    const fixed = await applyFixesToBytes(enc.encode(text), proposals);
    expect(dec.decode(fixed.bytes)).toBe(text.replace("rainfal,", "rainfall,"));
    expect(fixed.changes).toEqual([
      { row: 1, column: "rainfal", before: "rainfal", after: "rainfall", proposal: "header.rename:rainfall" },
    ]);
    const after = await checkBatch(chunks(fixed.bytes), p);
    const before = report.findings.map((f) => f.code);
    expect(after.findings.filter((f) => f.code.startsWith("plan.column"))).toEqual([]);
    // the model could not be built without the column; now it is, the report adds the F test's
    // power note (df.power, always given for a fitted model) and nothing else
    const added = after.findings.filter((f) => !before.includes(f.code));
    expect(added.map((f) => [f.code, f.severity])).toEqual([["df.power", "note"]]);
    expect(after.fit).not.toBeNull();
  });

  test("only the named proposals are applied; the change log reads back as CSV", async () => {
    const { text, plan: p } = faultyBatch(40);
    const { proposals } = await checked(text, p);
    const { chosen, unknown } = selectProposals(proposals, ["level.variant", "nope"]);
    expect(unknown).toEqual(["nope"]);
    const fixed = await applyFixesToBytes(enc.encode(text), chosen);
    expect(fixed.changes.every((c) => c.column === "soil" && c.after === "clay")).toBe(true);
    const log = changeLogCsv(fixed.changes).split("\r\n");
    expect(log[0]).toBe("row,column,before,after,proposal");
    expect(log.length).toBe(fixed.changes.length + 2);
    expect(log).toContain(
      `${fixed.changes[0]!.row},soil,${fixed.changes[0]!.before},clay,level.variant:soil`,
    );
  });
});

describe("what is not certain is not changed", () => {
  test("a cell is never made a formula (OWASP CSV Injection), and a one-column row is never blanked", async () => {
    const p = plan({
      columns: [
        { name: "soil", role: "carry", type: "category" },
        { name: "y", role: "response", type: "number" },
      ],
      missingTokens: ["", "NA"],
    });
    const text = "soil\n =cmd()\nloam \nNA\nloam\n";
    const { proposals } = await checked(text, p);
    expect(proposals.map((x) => [x.id, x.cells])).toEqual([
      ["missing.token:soil", 1],
      ["text.trim:soil", 1],
    ]);
    const fixed = await applyFixesToBytes(enc.encode(text), proposals);
    expect(dec.decode(fixed.bytes)).toBe('soil\n =cmd()\nloam\n""\nloam\n');
    expect((await checkBatch(chunks(fixed.bytes), p)).rows.total).toBe(4);
  });

  test("an ambiguous date order, a column mixing comma and point, a suspected sentinel", async () => {
    const rows = cleanRows(120, 3).map((r, i) => {
      const row: Row = [...r];
      const day = 1 + (i % 12);
      row[7] = `${day}/${1 + ((i * 5) % 12)}/2026`; // every part ≤ 12: day/month or month/day
      row[8] = i % 2 ? `"${String(row[8]).replace(".", ",")}"` : row[8]!; // comma and point mixed
      if (i % 20 === 3) row[6] = -9999; // far outside the rest, but not declared
      return row;
    });
    const text = [HEADER.join(","), ...rows.map((r) => r.join(","))].join("\n") + "\n";
    const p = plan();
    const { report, proposals } = await checked(text, p);
    const codes = report.findings.map((f) => f.code);
    expect(codes).toEqual(
      expect.arrayContaining(["date.ambiguous", "number.decimal-comma", "number.sentinel"]),
    );
    expect(report.findings.find((f) => f.code === "number.sentinel")!.detail!.declared).toBe(false);
    expect(proposals).toEqual([]);
    const fixed = await applyFixesToBytes(enc.encode(text), proposals);
    expect(dec.decode(fixed.bytes)).toBe(text);
  });

  test("a plan's date format that the values contradict is not used", async () => {
    const rows = cleanRows(30, 4).map((r) => [
      ...r.slice(0, 7),
      `4/${+String(r[7]).slice(8, 10) + 12 > 31 ? 13 : +String(r[7]).slice(8, 10) + 12}/2026`,
      r[8]!,
    ]);
    const text = [HEADER.join(","), ...rows.map((r) => r.join(","))].join("\n") + "\n";
    const p = plan();
    p.columns.find((c) => c.name === "sow_date")!.dateFormat = "dmy";
    const { proposals } = await checked(text, p);
    expect(proposals.filter((x) => x.code === "date.iso")).toEqual([]);
  });
});

/** CSV text of one value, quoted at random (always when it must be), as a provider's export might write it. */
function rawField(v: string, r: () => number): string {
  const must = /[",\r\n]/.test(v);
  return must || r() < 0.3 ? `"${v.replace(/"/g, '""')}"` : v;
}

describe("byte-faithful rewriting on random files", () => {
  const PLAN = (() => {
    const p = plan();
    p.columns.find((c) => c.name === "rainfall")!.sentinels = [-999];
    return p;
  })();
  const NOTES = ['said "wet", then dry', "row\nbreak", "a, b", "", "=1+2", "plain", "  spaced  "];
  const SOIL_WRITTEN = [...SOILS, "Clay", "clay ", " Loam", "SAND", "NA", "peat ", "silt"];

  for (const seed of [11, 12, 13, 14, 15]) {
    test(`seed ${seed}: only covered cells differ, the change log lists exactly them`, async () => {
      const r = rng(seed);
      const pick = <T>(xs: readonly T[]) => xs[Math.floor(r() * xs.length)]!;
      const header = [...HEADER, "note"];
      const base = cleanRows(300 + Math.floor(r() * 300), seed);
      // the cells as written, each record's raw pieces, and the line each record starts on
      const cells: string[][] = [header];
      for (const row of base) {
        const c = row.map(String);
        c[2] = pick(SOIL_WRITTEN);
        c[8] = c[8]!.includes(".") ? c[8]!.replace(".", ",") : c[8]!;
        if (r() < 0.05) c[6] = "-999";
        if (r() < 0.05) c[1] = "NA";
        c[7] = `${+c[7]!.slice(8, 10)}/4/2026`;
        c.push(pick(NOTES));
        cells.push(c);
      }
      cells[1]![7] = "28/4/2026"; // the order is certain
      const raw = cells.map((c) => c.map((v) => rawField(v, r)));
      const ends = cells.map(() => (r() < 0.5 ? "\r\n" : "\n"));
      const blank = cells.map(() => (r() < 0.03 ? ends[0] : ""));
      const lines: number[] = [];
      let line = 1;
      const breaks = (s: string) => (s.match(/\r\n|\r|\n/g) ?? []).length;
      for (let i = 0; i < cells.length; i++) {
        lines.push(line);
        line += breaks(raw[i]!.join(",")) + 1 + (blank[i] ? 1 : 0);
      }
      const build = (pieces: string[][]) =>
        "\uFEFF" + pieces.map((p, i) => p.join(",") + ends[i] + blank[i]).join("");
      const text = build(raw);

      // the oracle: what each proposal does, written from the rules in CHECKS.md
      const fold = (s: string) => s.trim().toLowerCase();
      const expected: FixChange[] = [];
      const want = raw.map((p) => [...p]);
      for (let i = 1; i < cells.length; i++) {
        const c = cells[i]!;
        const set = (k: number, after: string, proposal: string) => {
          expected.push({ row: lines[i]!, column: header[k]!, before: c[k]!, after, proposal });
          want[i]![k] = /[",\r\n]/.test(after) ? `"${after}"` : after;
        };
        if (c[1] === "NA") set(1, "", "missing.token:farm");
        if (c[2] === "NA") set(2, "", "missing.token:soil");
        else if (!SOILS.includes(c[2]!) && SOILS.includes(fold(c[2]!)))
          set(2, fold(c[2]!), "level.variant:soil");
        else if (c[2]!.trim() !== c[2]) set(2, c[2]!.trim(), "text.trim:soil");
        if (c[6] === "-999") set(6, "", "number.sentinel:rainfall");
        const [d, m, y] = c[7]!.split("/");
        set(7, `${y}-${m!.padStart(2, "0")}-${d!.padStart(2, "0")}`, "date.iso:sow_date");
        if (c[8]!.includes(",")) set(8, c[8]!.replace(",", "."), "number.decimal-comma:yield");
      }

      const report = await checkBatch(chunks(text, 4093), PLAN);
      const proposals = await proposeFixes(chunks(text, 4093), PLAN, report);
      expect(new Set(proposals.map((x) => x.code))).toEqual(
        new Set([
          "missing.token",
          "level.variant",
          "text.trim",
          "number.sentinel",
          "date.iso",
          "number.decimal-comma",
        ]),
      );
      // each proposal's count (the tally, read from the bytes) is the cells it changes
      for (const x of proposals)
        expect(x.cells, x.id).toBe(expected.filter((e) => e.proposal === x.id).length);
      // small chunks cross every field and record boundary, and the reader's buffer moves
      const applied = applyFixes(chunks(text, 1 + (seed % 7)), proposals);
      const parts: Uint8Array[] = [];
      for await (const c of applied.output) parts.push(c);
      const out = dec.decode(Buffer.concat(parts));
      expect(out).toBe(build(want));
      const order = (a: FixChange, b: FixChange) =>
        a.row - b.row || header.indexOf(a.column) - header.indexOf(b.column);
      expect([...applied.changes].sort(order)).toEqual(expected.sort(order));
      const after = await checkBatch(chunks(out), PLAN);
      expect(after.rows.total).toBe(report.rows.total);
      expect(after.file!.encoding).toBe("utf-8 (BOM)");
    });
  }
});

describe("the proposals' own list", () => {
  test("CHECKS.md's Fix proposals table lists exactly FIX_CODES, and no finding row", async () => {
    const fs = await import("node:fs");
    const md = fs.readFileSync(new URL("../../lib/readiness/CHECKS.md", import.meta.url), "utf8");
    const rows = [...md.matchAll(/^\|\s*`([a-z]+\.[a-z-]+)` fix\s*\|/gm)].map((m) => m[1]);
    expect(rows.sort()).toEqual(Object.keys(FIX_CODES).sort());
  });
});
