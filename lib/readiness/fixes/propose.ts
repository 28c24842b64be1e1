/**
 * The fix proposals of a checked batch file: a tally of one pass through the one reader
 * (./tally.ts) and the report's findings, keeping only the certain fixes — a decimal comma only
 * where no cell of the column uses a decimal point, a date order only where the values (or the
 * plan's date format, uncontradicted) settle it, a sentinel only when declared in the plan or
 * confirmed by the caller. Ambiguous cases stay findings.
 */
import { readCsv, type ByteInput } from "../csv-reader";
import type { Plan } from "../plan";
import type { ReadinessReport } from "../report";
import { columnCandidates, renameCandidates, type Candidate } from "./candidates";
import { ruleFixer } from "./cells";
import { FixTallyData, type ColumnTally, type RuleCount, type TallyOptions } from "./tally";
import type { FixExample, FixProposal } from "./types";

export type { TallyOptions } from "./tally";

export type ConfirmedSentinel = { column: string; value: number };

export interface ProposeOptions {
  /** sentinels the provider or analyst confirmed, beyond the plan's declared ones */
  confirmedSentinels?: ConfirmedSentinel[];
  /** examples per proposal (default 3) */
  examples?: number;
  isUtf8?: (b: Uint8Array) => boolean;
}

/** A tally in the making or made: its reader's sink, and the proposals it gives a report. */
export interface FixTally {
  readonly sink: FixTallyData;
  /**
   * The proposals for `report` (the check of the same file). A confirmed sentinel must be one
   * the tally counted (declared, or named in `sentinelValues`); otherwise this throws.
   */
  proposals(report: ReadinessReport, opts?: { confirmedSentinels?: ConfirmedSentinel[] }): FixProposal[];
}

/** The first `cap` examples of several counts, in file order, one per distinct before. */
function firstExamples(lists: FixExample[][], cap: number): FixExample[] {
  const out: FixExample[] = [];
  for (const e of lists.flat().sort((a, b) => a.row - b.row)) {
    if (out.length >= cap) break;
    if (!out.some((o) => o.before === e.before)) out.push(e);
  }
  return out;
}

type Counted = { cells: number; examples: FixExample[] };

/** What candidate `c` changes, from the column's tally; null when the tally cannot count it. */
function countOf(c: Candidate, col: ColumnTally, cap: number, confirmed: number[]): Counted | null {
  const rule = c.rule;
  const plain = (n: RuleCount | null) => (n ? { cells: n.cells, examples: n.examples } : null);
  switch (rule.kind) {
    case "empty-tokens":
      return plain(col.tokens);
    case "decimal-comma":
      return plain(col.comma);
    case "date":
      return plain(rule.order === "dmy" ? col.dmy : col.mdy);
    case "empty-numbers": {
      const counts = rule.values.map((v) => col.sentinels.get(v));
      if (counts.some((n) => !n)) {
        const missing = rule.values.filter((v) => !col.sentinels.has(v) && confirmed.includes(v));
        throw new Error(
          `The sentinel ${missing.join(", ")} of ${c.column} was not counted; tally the file with it among sentinelValues.`,
        );
      }
      return {
        cells: counts.reduce((s, n) => s + n!.cells, 0),
        examples: firstExamples(
          counts.map((n) => n!.examples),
          cap,
        ),
      };
    }
    case "map": {
      if (!col.near || col.nearOverflow) return null;
      const keys = Object.keys(rule.values);
      if (keys.some((k) => !col.near!.has(k))) return null;
      const fix = ruleFixer(rule);
      const hits = keys.filter((k) => fix(k) !== null).map((k) => ({ k, n: col.near!.get(k)! }));
      return {
        cells: hits.reduce((s, h) => s + h.n.count, 0),
        examples: firstExamples([hits.map((h) => ({ row: h.n.row, before: h.k, after: fix(h.k)! }))], cap),
      };
    }
    case "trim": {
      const trim = col.trim!;
      const near = [...(col.near ?? new Map()).entries()].filter(([, n]) => n.trims);
      const except = near.filter(([k]) => rule.except.includes(k));
      const rest = near.filter(([k]) => !rule.except.includes(k));
      return {
        cells: trim.cells - except.reduce((s, [, n]) => s + n.count, 0),
        examples: firstExamples(
          [trim.examples, rest.map(([k, n]) => ({ row: n.row, before: k, after: trim.fix(k)! }))],
          cap,
        ),
      };
    }
    case "rename":
      return null;
  }
}

function proposalsOf(
  t: FixTallyData,
  report: ReadinessReport,
  confirmedAll: ConfirmedSentinel[],
): FixProposal[] {
  if (report.status !== "checked" || !t.meta) return [];
  // the tally read the file as the check did, or its counts are not the report's file
  if (report.file?.delimiter && report.file.delimiter !== t.meta.delimiter) return [];
  const { plan } = t;
  const cap = t.opts.examples ?? 3;
  const out: FixProposal[] = [];
  for (const r of renameCandidates(t.header, plan, report)) {
    const from = (r.rule as { from: string }).from;
    const raw = t.header.find((h) => h.trim() === from) ?? from;
    out.push({ ...r, cells: 1, examples: [{ row: 1, before: raw, after: r.column }] });
  }
  for (const col of t.columns) {
    const pc = col.pc;
    const confirmed = confirmedAll.filter((s) => s.column === pc.name).map((s) => s.value);
    let list = columnCandidates(pc, plan, report, confirmed);
    const level = list.find((c) => c.rule.kind === "map");
    if (level && !countOf(level, col, cap, confirmed)) {
      // a level merge the tally could not count is not proposed; trim then leaves no exception
      list = list
        .filter((c) => c !== level)
        .map((c) => (c.rule.kind === "trim" ? { ...c, rule: { kind: "trim", except: [] } } : c));
    }
    const fromData = col.a13 > 0 && col.b13 === 0 ? "dmy" : col.b13 > 0 && col.a13 === 0 ? "mdy" : null;
    const hint = pc.dateFormat === "dmy" || pc.dateFormat === "mdy" ? pc.dateFormat : null;
    // values on both sides of 12 contradict each other; the plan's format counts when no value contradicts it
    const contradicted =
      (col.a13 > 0 && col.b13 > 0) || (fromData !== null && hint !== null && fromData !== hint);
    const order = contradicted ? null : (fromData ?? hint);
    for (const c of list) {
      const n = countOf(c, col, cap, confirmed);
      if (!n || n.cells === 0) continue;
      if (c.rule.kind === "decimal-comma" && col.point > 0) continue;
      if (c.rule.kind === "date") {
        if (c.rule.order !== order) continue;
        out.push({ ...c, id: `date.iso:${c.column}`, ...n });
        continue;
      }
      out.push({ ...c, ...n });
    }
  }
  return out;
}

/** A tally to feed a reader (its `sink`); read the file into it, then ask for proposals. */
export function fixTally(plan: Plan, opts: TallyOptions = {}): FixTally {
  const sink = new FixTallyData(plan, opts);
  return {
    sink,
    proposals: (report, o = {}) => proposalsOf(sink, report, o.confirmedSentinels ?? []),
  };
}

/** One pass over a file into a tally (no report needed: it may run beside the check). */
export async function tallyFixes(
  input: ByteInput,
  plan: Plan,
  opts: TallyOptions & { isUtf8?: (b: Uint8Array) => boolean; delimiter?: string } = {},
): Promise<FixTally> {
  const t = fixTally(plan, opts);
  await readCsv(input, t.sink, { isUtf8: opts.isUtf8, delimiter: opts.delimiter });
  t.sink.complete = true;
  return t;
}

/** The mechanical fix proposals for a checked batch file, counted on the file itself. */
export async function proposeFixes(
  input: ByteInput,
  plan: Plan,
  report: ReadinessReport,
  opts: ProposeOptions = {},
): Promise<FixProposal[]> {
  if (report.status !== "checked") return [];
  const confirmedSentinels = opts.confirmedSentinels ?? [];
  const t = await tallyFixes(input, plan, {
    examples: opts.examples,
    isUtf8: opts.isUtf8,
    delimiter: report.file?.delimiter || undefined,
    sentinelValues: confirmedSentinels,
  });
  return t.proposals(report, { confirmedSentinels });
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
