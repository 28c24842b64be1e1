/**
 * The fix tally: one pass over a batch file that counts, for every mechanical fix the plan's
 * columns could get, the cells it would change — without the report, so it can read the same
 * bytes as the check at the same time (the server's check job downloads a file once).
 * ./propose.ts turns a tally and the report into the proposals. It reads the reader's byte
 * spans: a field no rule can change is settled from its bytes, and what the rules make of a
 * value is worked out once while the column repeats its values. Memory is bounded: counts per
 * rule, a few examples, per column at most MEMO_CAP remembered values, and per category column
 * at most LEVEL_CAP values near a planned level.
 */
import type { CsvMeta, CsvSink } from "../csv-reader";
import { fieldText, type FieldBatch } from "../fields";
import { LevelIndex } from "../level-index";
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

const encoder = new TextEncoder();

/** Fields a column can settle from their bytes alone (ColumnTally.untouched). */
const enum Quick {
  None,
  /** only the missing-value tokens apply (text, boolean columns) */
  TokensOnly,
  /** a number column without sentinels: a plain decimal is changed by no rule */
  Number,
}

/** Distinct values near a planned level tracked per column; beyond it the level merge is not proposed. */
export const LEVEL_CAP = 2000;
const CACHE_CAP = 5000;
/** Distinct values whose outcome a column keeps; when it fills with mostly unrepeated values, it is dropped. */
const MEMO_CAP = 2048;
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
  /** Count the cell as the rule writes it (`after`, this.fix(s); null when it leaves the cell). */
  add(s: string, after: string | null, row: number, example = true): void {
    if (after === null) return;
    this.cells++;
    if (example && this.examples.length < this.cap && !this.examples.some((e) => e.before === s))
      this.examples.push({ row, before: s, after });
  }
}

/**
 * What a column's rules make of one value — pure, so worked out once per distinct value while
 * the column repeats its values (dates, levels, rounded numbers). Null where a rule is absent.
 */
type Outcome = {
  token: string | null;
  trim: string | null;
  near: boolean;
  /** reads as a number with a decimal point or an exponent */
  pointed: boolean;
  comma: string | null;
  sentinel: RuleCount | null;
  sentinelAfter: string | null;
  /** a day/month pair: 1 when its first part exceeds 12, 2 when its second does (both: 3); -1 when not a pair */
  pair: number;
  dmy: string | null;
  mdy: string | null;
};

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
  /** which fields untouched() may settle from their bytes */
  private quick = Quick.None;
  /** the UTF-8 lengths of the missing-value tokens */
  private tokenLengths = new Set<number>();
  private isNear: (s: string) => boolean = () => false;
  private nearCache = new Map<string, boolean>();
  /** outcomes by the value's bytes, while the column repeats its values (dropped when it does not) */
  private memo: LevelIndex<Outcome> | null = new LevelIndex();
  private memoHits = 0;

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
    for (const t of tokens) this.tokenLengths.add(encoder.encode(t).length);
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
    if (!this.trim && !this.comma && !this.dmy) this.quick = Quick.TokensOnly;
    else if (this.comma && this.sentinels.size === 0) this.quick = Quick.Number;
  }

  private nearLevel(s: string): boolean {
    const hit = this.nearCache.get(s);
    if (hit !== undefined) return hit;
    const near = this.isNear(s);
    if (this.nearCache.size < CACHE_CAP) this.nearCache.set(s, near);
    return near;
  }

  /** Count the non-empty field buf[a, b) of line `row`. */
  seeBytes(buf: Uint8Array, a: number, b: number, row: number): void {
    if (this.quick !== Quick.None && this.untouched(buf, a, b)) return;
    const memo = this.memo;
    const hit = memo?.find(buf, a, b);
    if (hit) {
      this.memoHits++;
      this.count(hit.text, hit.value, row);
      return;
    }
    const s = fieldText(buf, a, b);
    const o = this.work(s);
    if (memo) {
      if (memo.size < MEMO_CAP) memo.add(s, o);
      else if (this.memoHits < memo.size) this.memo = null;
    }
    this.count(s, o, row);
  }

  /**
   * Whether no rule of a token-only or number column (without sentinels) changes buf[a, b):
   * ASCII at both ends (nothing to trim), not as long as a token, and for a number column a
   * plain decimal (its decimal point counted). Such fields, most of a clean file, make no string.
   */
  private untouched(buf: Uint8Array, a: number, b: number): boolean {
    const c0 = buf[a]!;
    const c1 = buf[b - 1]!;
    if (c0 <= 32 || c0 >= 128 || c1 <= 32 || c1 >= 128 || this.tokenLengths.has(b - a)) return false;
    if (this.quick === Quick.TokensOnly) return true;
    let i = c0 === 45 ? a + 1 : a;
    let digits = 0;
    let point = false;
    for (; i < b; i++) {
      const c = buf[i]!;
      if (c >= 48 && c <= 57) digits++;
      else if (c === 46 && !point) point = true;
      else return false;
    }
    if (digits === 0) return false;
    if (point) this.point++;
    return true;
  }

  private work(s: string): Outcome {
    const t = s.trim();
    const o: Outcome = {
      token: this.tokens ? this.tokens.fix(s) : null,
      trim: this.trim ? this.trim.fix(s) : null,
      near: this.near !== null && this.nearLevel(s),
      pointed: false,
      comma: null,
      sentinel: null,
      sentinelAfter: null,
      pair: -1,
      dmy: null,
      mdy: null,
    };
    if (this.comma) {
      // each number is read once: a cell that reads with a point is never a decimal-comma fix
      // (commaToPoint), and is its own value for the sentinels (cellNumber)
      const vs = readNumber(s);
      const vt = t === s ? vs : readNumber(t);
      o.pointed = vt === vt && POINTED.test(t);
      if (vs !== vs) o.comma = this.comma.fix(s);
      if (this.sentinels.size) {
        const v = vs === vs ? vs : cellNumber(s);
        o.sentinel = v === v ? (this.sentinels.get(v) ?? null) : null;
        if (o.sentinel) o.sentinelAfter = o.sentinel.fix(s);
      }
    }
    if (this.dmy) {
      // only a day/month pair can become an ISO date (isoDate), so the two orders are tried only then
      const d = parseDate(t);
      if (d.kind === "pair") {
        o.pair = (d.a > 12 ? 1 : 0) | (d.b > 12 ? 2 : 0);
        o.dmy = this.dmy.fix(s);
        o.mdy = this.mdy!.fix(s);
      }
    }
    return o;
  }

  private count(s: string, o: Outcome, row: number): void {
    this.tokens?.add(s, o.token, row);
    if (this.trim) {
      let tracked = false;
      if (this.near && !this.nearOverflow && o.near) {
        const n = this.near.get(s);
        if (n) n.count++;
        else if (this.near.size < LEVEL_CAP) this.near.set(s, { count: 1, row, trims: o.trim !== null });
        else this.nearOverflow = true;
        tracked = !this.nearOverflow;
      }
      this.trim.add(s, o.trim, row, !tracked);
    }
    if (this.comma) {
      if (o.pointed) this.point++;
      this.comma.add(s, o.comma, row);
      o.sentinel?.add(s, o.sentinelAfter, row);
    }
    if (o.pair >= 0) {
      if (o.pair & 1) this.a13++;
      if (o.pair & 2) this.b13++;
      this.dmy!.add(s, o.dmy, row);
      this.mdy!.add(s, o.mdy, row);
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

  onBatch(b: FieldBatch): void {
    const { buf, starts, ends, recs, lines } = b;
    for (let r = b.first; r < b.count; r++) {
      const f0 = recs[r]!;
      const n = recs[r + 1]! - f0;
      for (const col of this.columns) {
        if (col.idx >= n) continue;
        const f = f0 + col.idx;
        if (ends[f]! > starts[f]!) col.seeBytes(buf, starts[f]!, ends[f]!, lines[r]!);
      }
    }
  }
}
