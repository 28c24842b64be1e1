/**
 * Rows at fault: a second pass over a batch file that yields each data row carrying a
 * row-level finding, with the row as read and what is wrong with it, so that a provider can
 * correct the rows in the spreadsheet. The rules are the single pass's own (Scan and
 * ColumnScan read every field again; a row is at fault when one of their counters moves);
 * what only the whole file can decide (suspected sentinels, ambiguous date order, unknown
 * levels and spelling variants) is taken from the batch's readiness report.
 */
import { checkBatch, hashPlan } from "./check";
import { FieldStatus, type ColumnScan } from "./column-scan";
import { readCsv, type ByteInput, type CsvLimits, type CsvMeta } from "./csv-reader";
import { quote } from "./findings";
import { article } from "./findings-rows";
import type { Plan } from "./plan";
import type { Finding, ReadinessReport } from "./report";
import { pulled } from "./records";
import { Scan } from "./scan";
import { recordText, type FieldBatch } from "./fields";

/** One thing wrong with a row: the finding's code, the column (null for the whole row), in plain words. */
export interface Fault {
  code: string;
  column: string | null;
  message: string;
}

/**
 * An item of rowsAtFault: the header (`kind: "header"`, line 1, yielded first, and only when
 * something follows or the header itself is at fault), then the rows at fault in file order.
 * `line` is the spreadsheet line where the record starts (header = 1; quoted line breaks count).
 */
export interface FaultLine {
  kind: "header" | "row";
  line: number;
  fields: string[];
  faults: Fault[];
}

export interface RowsAtFaultOptions {
  /** the report checkBatch gave for this file and plan; without it `input` must be a function that opens the file again */
  report?: ReadinessReport;
  /** the reading limits the check used (tests) */
  limits?: Partial<CsvLimits>;
  /** a fast strict UTF-8 validator (Node's buffer.isUtf8) */
  isUtf8?: (b: Uint8Array) => boolean;
}

/** Codes a row can be at fault with (the row-level findings of lib/readiness/CHECKS.md). */
export const ROW_FAULT_CODES = [
  "row.ragged",
  "row.duplicate",
  "key.duplicate",
  "type.mismatch",
  "number.decimal-comma",
  "number.sentinel",
  "value.out-of-range",
  "date.ambiguous",
  "level.unknown",
  "level.variant",
  "missing.response",
  "missing.column",
] as const;

/** Findings of the report that only the whole file decides, by column. */
interface Decisions {
  suspected: Map<string, number>;
  ambiguousDates: Set<string>;
  unknown: Map<string, Set<string>>;
  variants: Map<string, Map<string, string>>;
  header: Fault[];
}

function decisionsOf(report: ReadinessReport): Decisions {
  const d: Decisions = {
    suspected: new Map(),
    ambiguousDates: new Set(),
    unknown: new Map(),
    variants: new Map(),
    header: [],
  };
  for (const f of report.findings as Finding[]) {
    const col = f.columns[0];
    const detail = (f.detail ?? {}) as Record<string, unknown>;
    if (f.code === "number.sentinel" && col && detail.declared === false)
      d.suspected.set(col, detail.value as number);
    else if (f.code === "date.ambiguous" && col) d.ambiguousDates.add(col);
    else if (f.code === "level.unknown" && col)
      d.unknown.set(col, new Set((detail.levels as { level: string }[]).map((l) => l.level)));
    else if (f.code === "level.variant" && col)
      d.variants.set(
        col,
        new Map((detail.merges as { from: string; to: string }[]).map((m) => [m.from, m.to])),
      );
    else if (
      (f.code === "header.duplicate" || f.code === "header.blank" || f.code === "plan.column-missing") &&
      f.rows.includes(1)
    ) {
      d.header.push({ code: f.code, column: col ?? null, message: f.message });
    }
  }
  return d;
}

const sentinelCount = (c: ColumnScan) => {
  let n = 0;
  for (const r of c.sentinels.values()) n += r.count;
  return n;
};

/** Scan with a look at its counters after every row: what moved is what is wrong with the row. */
class FaultScan extends Scan {
  out: FaultLine[] = [];
  private before = new Float64Array(0);
  constructor(
    plan: Plan,
    private d: Decisions,
  ) {
    super(plan);
  }

  override onHeader(fields: string[], meta: CsvMeta): void {
    super.onHeader(fields, meta);
    // the model's figures are the first pass's business; this pass only needs the rows' rules
    this.ready = false;
    this.before = new Float64Array(this.cols.length * 6);
  }

  /** this pass reads strings: each row is compared with the counters it moved */
  override onBatch(b: FieldBatch): void {
    for (let r = b.first; r < b.count; r++) this.onRecords([recordText(b, r)], [b.lines[r]!]);
  }

  override onRecords(rows: string[][], lines: number[]): void {
    const cols = this.cols;
    const b = this.before;
    for (let r = 0; r < rows.length; r++) {
      const f = rows[r]!;
      const line = lines[r]!;
      for (let j = 0; j < cols.length; j++) {
        const c = cols[j]!;
        b[6 * j] = c.missing.count;
        b[6 * j + 1] = c.mismatch.count;
        b[6 * j + 2] = c.comma.count;
        b[6 * j + 3] = c.range.count;
        b[6 * j + 4] = sentinelCount(c);
        b[6 * j + 5] = c.date.ambiguous?.count ?? 0;
      }
      const ragged = this.ragged.count;
      const dups = this.duplicateRows.count;
      const keyDups = [...this.keys.values()].map((k) => k.dup.count);
      super.onRecords([f], [line]);
      const faults: Fault[] = [];
      if (this.ragged.count > ragged) {
        faults.push({
          code: "row.ragged",
          column: null,
          message: `This row has ${f.length} fields; the header has ${this.header.length}. A value may hold an unquoted delimiter, or cells are missing or extra.`,
        });
      } else {
        if (this.duplicateRows.count > dups)
          faults.push({
            code: "row.duplicate",
            column: null,
            message: `This row repeats row ${this.lastRepeatOf} exactly.`,
          });
        let q = 0;
        for (const [k, key] of this.keys) {
          if (key.dup.count > keyDups[q++]!)
            faults.push({
              code: "key.duplicate",
              column: cols[k]!.name,
              message: `The key ${quote(f[k]!)} is already used on row ${key.lastRepeatOf}.`,
            });
        }
        for (let j = 0; j < cols.length; j++) this.columnFaults(cols[j]!, f[j]!, j, faults);
      }
      if (faults.length) this.out.push({ kind: "row", line, fields: f, faults });
    }
  }

  private columnFaults(c: ColumnScan, v: string, j: number, faults: Fault[]): void {
    const pc = c.plan;
    if (!pc || c.kind === "ignore") return;
    const b = this.before;
    const name = c.name;
    if (c.mismatch.count > b[6 * j + 1]!)
      faults.push({
        code: "type.mismatch",
        column: name,
        message: `${quote(v)} is not ${article(pc.type)}.`,
      });
    if (c.comma.count > b[6 * j + 2]!)
      faults.push({
        code: "number.decimal-comma",
        column: name,
        message: `${quote(v)} is written with a decimal comma; write it with a point.`,
      });
    if (sentinelCount(c) > b[6 * j + 4]!)
      faults.push({
        code: "number.sentinel",
        column: name,
        message: `${quote(v)} is the plan's missing-value code; leave the cell empty instead.`,
      });
    else if (c.status === FieldStatus.Usable && this.d.suspected.get(name) === c.value) {
      faults.push({
        code: "number.sentinel",
        column: name,
        message: `${quote(v)} lies far outside the column's other values: probably a code for “missing”; leave the cell empty if it was not measured.`,
      });
    }
    if (c.range.count > b[6 * j + 3]!) {
      const bounds = [
        pc.min !== undefined ? `min ${pc.min}` : null,
        pc.max !== undefined ? `max ${pc.max}` : null,
      ]
        .filter(Boolean)
        .join(", ");
      faults.push({
        code: "value.out-of-range",
        column: name,
        message: `${quote(v)} is outside the plan's range (${bounds}).`,
      });
    }
    if ((c.date.ambiguous?.count ?? 0) > b[6 * j + 5]! && this.d.ambiguousDates.has(name)) {
      faults.push({
        code: "date.ambiguous",
        column: name,
        message: `${quote(v)} could be day/month or month/day; write it as YYYY-MM-DD.`,
      });
    }
    if (c.status === FieldStatus.Usable && c.kind === "category") {
      const to = this.d.variants.get(name)?.get(v);
      if (to !== undefined)
        faults.push({
          code: "level.variant",
          column: name,
          message: `${quote(v)} is a spelling variant: write ${quote(to)}.`,
        });
      if (this.d.unknown.get(name)?.has(v))
        faults.push({
          code: "level.unknown",
          column: name,
          message: `${quote(v)} is not a level of the plan${pc.levels?.length ? ` (${pc.levels.join(", ")})` : ""}.`,
        });
    }
    if (
      c.missing.count > b[6 * j]! &&
      (pc.role === "response" || pc.role === "predictor" || pc.role === "key")
    ) {
      faults.push({
        code: pc.role === "response" ? "missing.response" : "missing.column",
        column: name,
        message:
          pc.role === "key"
            ? `The key ${quote(name)} is empty.`
            : `${quote(name)} has no value: the row cannot enter the planned model.`,
      });
    }
  }
}

/** rows yielded per byte chunk at most before reading pauses for the consumer */
const HIGH_WATER = 2000;

/**
 * Stream a batch file again and yield, after the header, every data row that carries at least
 * one row-level finding of its readiness report: `{kind: "row", line, fields, faults}`.
 * A clean file yields nothing. Memory is bounded as in checkBatch (duplicates by the same
 * 64-bit hashing). Pass the report checkBatch gave for this file and plan as `opts.report`;
 * without it, give `input` as a function that opens the file (called twice: check, then this
 * pass). Throws UnreadableError (from ./decode) for a file checkBatch calls unreadable, and an
 * Error when the report belongs to another plan.
 */
export async function* rowsAtFault(
  input: ByteInput | (() => ByteInput),
  plan: Plan,
  opts: RowsAtFaultOptions = {},
): AsyncGenerator<FaultLine, void, undefined> {
  let report = opts.report;
  if (!report) {
    if (typeof input !== "function")
      throw new Error(
        "rowsAtFault needs the file's readiness report (opts.report) or a function that opens the file again.",
      );
    report = await checkBatch(input(), plan, { limits: opts.limits, isUtf8: opts.isUtf8 });
  } else if (report.planHash !== (await hashPlan(plan))) {
    throw new Error(
      "The readiness report was checked against a different data plan; check the file against this plan first.",
    );
  }
  const source = typeof input === "function" ? input() : input;
  const decisions = decisionsOf(report);
  const scan = new FaultScan(plan, decisions);
  const header = (): FaultLine => ({
    kind: "header",
    line: 1,
    fields: scan.header,
    faults: decisions.header,
  });
  let headerSent = false;
  for await (const item of pulled(
    source,
    scan,
    (bytes) => readCsv(bytes, scan, { limits: opts.limits, isUtf8: opts.isUtf8 }),
    HIGH_WATER,
  )) {
    if (!headerSent) {
      headerSent = true;
      yield header();
    }
    yield item;
  }
  if (!headerSent && decisions.header.length > 0 && scan.header.length > 0) yield header();
}
