/**
 * The fix tally: one pass over a batch file that counts, for every mechanical fix the plan's
 * columns could get, the cells it would change — without the report, so it can read the same
 * bytes as the check at the same time (the server's check job downloads a file once).
 * ./propose.ts turns a tally and the report into the proposals. Memory is bounded: counts per
 * rule, a few examples, and per category column at most LEVEL_CAP values near a planned level.
 */
import type { CsvMeta, CsvSink } from "../csv-reader";
import type { Plan, PlanColumn } from "../plan";
import { foldLevel, oneEditApart, parseDate, readNumber } from "../values";
import { cellNumber, ruleFixer } from "./cells";
import type { FixExample, FixRule } from "./types";

export interface TallyOptions {
  /** numbers that may become confirmed sentinels (a report's suspected ones), counted beside the declared */
  sentinelValues?: { column: string; value: number }[];
  /** examples per proposal (default 3) */
  examples?: number;
}

/** Distinct values near a planned level tracked per column; beyond it the level merge is not proposed. */
export const LEVEL_CAP = 2000;
const CACHE_CAP = 5000;
const POINTED = /[.eE]/;

/** The cells one rule changes when applied alone: how many, and the first cell of each distinct before. */
export class RuleCount {
  cells = 0;
  examples: FixExample[] = [];
  readonly fix: (s: string) => string | null;
  constructor(
    readonly rule: FixRule,
    private readonly cap: number,
  ) {
    this.fix = ruleFixer(rule);
  }
  /** Count the cell; true when the rule changes it. */
  see(s: string, row: number, example = true): boolean {
    const after = this.fix(s);
    if (after === null) return false;
    this.cells++;
    if (example && this.examples.length < this.cap && !this.examples.some((e) => e.before === s))
      this.examples.push({ row, before: s, after });
    return true;
  }
}

/** A value near a planned level: its cells, the line of its first, and whether trimming changes it. */
export type NearLevel = { count: number; row: number; trims: boolean };

export class ColumnTally {
  tokens: RuleCount | null = null;
  /** trim with no exception; examples only of values not in `near` (those have their own row) */
  trim: RuleCount | null = null;
  near: Map<string, NearLevel> | null = null;
  nearOverflow = false;
  sentinels = new Map<number, RuleCount>();
  comma: RuleCount | null = null;
  dmy: RuleCount | null = null;
  mdy: RuleCount | null = null;
  /** cells with a decimal point (or exponent) that read as numbers */
  point = 0;
  /** day/month pairs whose first part exceeds 12, whose second does */
  a13 = 0;
  b13 = 0;
  private isNear: (s: string) => boolean = () => false;
  private nearCache = new Map<string, boolean>();

  constructor(
    readonly idx: number,
    readonly pc: PlanColumn,
    plan: Plan,
    sentinelValues: number[],
    cap: number,
  ) {
    const tokens = [...new Set([...plan.missingTokens, ...(pc.missingTokens ?? [])])].filter(
      (t) => t.trim() !== "",
    );
    if (tokens.length) this.tokens = new RuleCount({ kind: "empty-tokens", tokens }, cap);
    if (pc.type === "category") {
      this.trim = new RuleCount({ kind: "trim", except: [] }, cap);
      const planned = pc.levels ?? [];
      if (planned.length) {
        this.near = new Map();
        const folded = planned.map(foldLevel);
        // as the engine finds level.variant merges (findings-data.ts): equal folded, or one edit apart (≥ 4 characters)
        this.isNear = (s) => {
          if (planned.includes(s)) return false;
          const f = foldLevel(s);
          return folded.some((l) => l === f || (Math.min(l.length, f.length) >= 4 && oneEditApart(f, l)));
        };
      }
    }
    if (pc.type === "number" || pc.type === "integer") {
      for (const v of new Set([...(pc.sentinels ?? []), ...sentinelValues]))
        this.sentinels.set(v, new RuleCount({ kind: "empty-numbers", values: [v] }, cap));
      this.comma = new RuleCount({ kind: "decimal-comma" }, cap);
    }
    if (pc.type === "date") {
      this.dmy = new RuleCount({ kind: "date", order: "dmy" }, cap);
      this.mdy = new RuleCount({ kind: "date", order: "mdy" }, cap);
    }
  }

  private nearLevel(s: string): boolean {
    const hit = this.nearCache.get(s);
    if (hit !== undefined) return hit;
    const near = this.isNear(s);
    if (this.nearCache.size < CACHE_CAP) this.nearCache.set(s, near);
    return near;
  }

  see(s: string, row: number): void {
    this.tokens?.see(s, row);
    if (this.trim) {
      let tracked = false;
      if (this.near && !this.nearOverflow && this.nearLevel(s)) {
        const n = this.near.get(s);
        if (n) n.count++;
        else if (this.near.size < LEVEL_CAP)
          this.near.set(s, { count: 1, row, trims: this.trim.fix(s) !== null });
        else this.nearOverflow = true;
        tracked = !this.nearOverflow;
      }
      this.trim.see(s, row, !tracked);
    }
    const t = s.trim();
    if (this.comma) {
      // each number is read once: a cell that reads with a point is never a decimal-comma fix
      // (commaToPoint), and is its own value for the sentinels (cellNumber)
      const vs = readNumber(s);
      const vt = t === s ? vs : readNumber(t);
      if (vt === vt && POINTED.test(t)) this.point++;
      if (vs !== vs) this.comma.see(s, row);
      if (this.sentinels.size) {
        const v = vs === vs ? vs : cellNumber(s);
        if (v === v) this.sentinels.get(v)?.see(s, row);
      }
    }
    if (this.dmy) {
      // only a day/month pair can become an ISO date (isoDate), so the two orders are tried only then
      const d = parseDate(t);
      if (d.kind === "pair") {
        if (d.a > 12) this.a13++;
        if (d.b > 12) this.b13++;
        this.dmy.see(s, row);
        this.mdy!.see(s, row);
      }
    }
  }
}

/** The tally of one file: its header, format and the planned columns' counts. */
export class FixTallyData implements CsvSink {
  header: string[] = [];
  meta: CsvMeta | null = null;
  columns: ColumnTally[] = [];
  /** set once the reader has read the whole file */
  complete = false;

  constructor(
    readonly plan: Plan,
    readonly opts: TallyOptions = {},
  ) {}

  onHeader(fields: string[], meta: CsvMeta): void {
    this.header = fields;
    this.meta = meta;
    const names = fields.map((h) => h.trim());
    const cap = this.opts.examples ?? 3;
    for (const pc of this.plan.columns) {
      const idx = names.indexOf(pc.name);
      if (idx < 0 || pc.role === "ignore") continue;
      const values = (this.opts.sentinelValues ?? []).filter((s) => s.column === pc.name).map((s) => s.value);
      this.columns.push(new ColumnTally(idx, pc, this.plan, values, cap));
    }
  }

  onRecords(rows: string[][], lines: number[]): void {
    for (let r = 0; r < rows.length; r++) {
      const row = rows[r]!;
      for (const col of this.columns) {
        if (col.idx >= row.length) continue;
        const s = row[col.idx]!;
        if (s !== "") col.see(s, lines[r]!);
      }
    }
  }
}
