/**
 * proposeFixes: one pass over a checked batch file through the one reader, counting what each
 * candidate fix (./candidates.ts) would change, and keeping only the certain ones: a decimal
 * comma only where no cell of the column uses a decimal point, a date order only where the
 * values (or the plan's date format, uncontradicted) settle it, a sentinel only when declared
 * in the plan or confirmed by the caller. Ambiguous cases stay findings.
 */
import { readCsv, type ByteInput } from "../csv-reader";
import type { Plan } from "../plan";
import type { ReadinessReport } from "../report";
import { parseDate, readNumber } from "../values";
import { columnCandidates, renameCandidates, type Candidate } from "./candidates";
import { columnFixer } from "./cells";
import type { FixExample, FixProposal } from "./types";

export interface ProposeOptions {
  /** sentinels the provider or analyst confirmed, beyond the plan's declared ones */
  confirmedSentinels?: { column: string; value: number }[];
  /** examples per proposal (default 3) */
  examples?: number;
  isUtf8?: (b: Uint8Array) => boolean;
}

interface Count {
  c: Candidate;
  fix: (s: string) => { after: string } | null;
  cells: number;
  examples: FixExample[];
}

interface ColumnStats {
  /** cells with a decimal point (or exponent) that read as numbers */
  point: number;
  /** day/month pairs whose first part exceeds 12, whose second does */
  a13: number;
  b13: number;
}

const POINTED = /[.eE]/;

/** The mechanical fix proposals for a checked batch file, counted on the file itself. */
export async function proposeFixes(
  input: ByteInput,
  plan: Plan,
  report: ReadinessReport,
  opts: ProposeOptions = {},
): Promise<FixProposal[]> {
  if (report.status !== "checked") return [];
  const cap = opts.examples ?? 3;
  let header: string[] = [];
  const counts: { idx: number; list: Count[]; stats: ColumnStats }[] = [];
  let renames: Candidate[] = [];

  const add = (n: Count, row: number, before: string, after: string) => {
    n.cells++;
    if (n.examples.length < cap && !n.examples.some((e) => e.before === before))
      n.examples.push({ row, before, after });
  };

  const sink = {
    onHeader(fields: string[]) {
      header = fields;
      const names = fields.map((h) => h.trim());
      renames = renameCandidates(fields, plan, report);
      for (const pc of plan.columns) {
        const idx = names.indexOf(pc.name);
        if (idx < 0) continue;
        const confirmed = (opts.confirmedSentinels ?? [])
          .filter((s) => s.column === pc.name)
          .map((s) => s.value);
        const list = columnCandidates(pc, plan, report, confirmed).map((c) => ({
          c,
          fix: columnFixer([{ ...c, cells: 0, examples: [] }]),
          cells: 0,
          examples: [],
        }));
        if (list.length) counts.push({ idx, list, stats: { point: 0, a13: 0, b13: 0 } });
      }
    },
    onRecords(rows: string[][], lines: number[]) {
      for (let r = 0; r < rows.length; r++) {
        const row = rows[r]!;
        for (const col of counts) {
          if (col.idx >= row.length) continue;
          const s = row[col.idx]!;
          if (s === "") continue;
          const t = s.trim();
          const st = col.stats;
          if (POINTED.test(t) && readNumber(t) === readNumber(t)) st.point++;
          const d = parseDate(t);
          if (d.kind === "pair") {
            if (d.a > 12) st.a13++;
            if (d.b > 12) st.b13++;
          }
          for (const n of col.list) {
            const f = n.fix(s);
            if (f) add(n, lines[r]!, s, f.after);
          }
        }
      }
    },
  };
  await readCsv(input, sink, { isUtf8: opts.isUtf8, delimiter: report.file?.delimiter || undefined });

  const out: FixProposal[] = [];
  for (const r of renames) {
    const from = (r.rule as { from: string }).from;
    const raw = header.find((h) => h.trim() === from) ?? from;
    out.push({ ...r, cells: 1, examples: [{ row: 1, before: raw, after: r.column }] });
  }
  for (const col of counts) {
    const pc = plan.columns.find((c) => c.name === header[col.idx]!.trim())!;
    const st = col.stats;
    const fromData = st.a13 > 0 && st.b13 === 0 ? "dmy" : st.b13 > 0 && st.a13 === 0 ? "mdy" : null;
    const hint = pc.dateFormat === "dmy" || pc.dateFormat === "mdy" ? pc.dateFormat : null;
    // values on both sides of 12 contradict each other; the plan's format counts when no value contradicts it
    const contradicted =
      (st.a13 > 0 && st.b13 > 0) || (fromData !== null && hint !== null && fromData !== hint);
    const order = contradicted ? null : (fromData ?? hint);
    for (const n of col.list) {
      if (n.cells === 0) continue;
      const rule = n.c.rule;
      if (rule.kind === "decimal-comma" && st.point > 0) continue;
      if (rule.kind === "date") {
        if (rule.order !== order) continue;
        out.push({ ...n.c, id: `date.iso:${n.c.column}`, cells: n.cells, examples: n.examples });
        continue;
      }
      out.push({ ...n.c, cells: n.cells, examples: n.examples });
    }
  }
  return out;
}

/** The report with its proposals (REPORT-FORMAT.md, `proposals`). */
export async function withProposals(
  report: ReadinessReport,
  input: ByteInput,
  plan: Plan,
  opts: ProposeOptions = {},
): Promise<ReadinessReport> {
  if (report.status !== "checked") return report;
  return { ...report, proposals: await proposeFixes(input, plan, report, opts) };
}
