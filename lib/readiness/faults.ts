/**
 * Rows at fault: a second pass over a batch file that yields each data row carrying a
 * row-level finding, with the row as read and what is wrong with it, so that a provider can
 * correct the rows in the spreadsheet. The rules are the single pass's own (Scan and
 * ColumnScan read every field again; a row is at fault when one of their counters moves);
 * what only the whole file can decide (suspected sentinels, ambiguous date order, unknown
 * levels and spelling variants) is taken from the batch's readiness report.
 */
import { checkBatch, hashPlan } from "./check";
import { readCsv, type ByteInput, type CsvLimits, type CsvMeta } from "./csv-reader";
import { columnFaults, decisionsOf, sentinelCount, type Decisions, type Fault } from "./faults-rules";
import { quote } from "./findings";
import type { Plan } from "./plan";
import type { ReadinessReport } from "./report";
import { pulled } from "./records";
import { Scan } from "./scan";
import { recordText, type FieldBatch } from "./fields";

export type { Fault };

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
        for (let j = 0; j < cols.length; j++) columnFaults(cols[j]!, f[j]!, j, this.before, this.d, faults);
      }
      if (faults.length) this.out.push({ kind: "row", line, fields: f, faults });
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
