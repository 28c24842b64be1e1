/**
 * What rows at fault (./faults.ts) take from the readiness report — the findings only the
 * whole file decides — and the faults of one field, from the column counters it moved.
 */
import { FieldStatus, type ColumnScan } from "./column-scan";
import { quote } from "./findings";
import { article } from "./findings-rows";
import type { Finding, ReadinessReport } from "./report";

/** One thing wrong with a row: the finding's code, the column (null for the whole row), in plain words. */
export interface Fault {
  code: string;
  column: string | null;
  message: string;
}

/** Findings of the report that only the whole file decides, by column. */
export interface Decisions {
  suspected: Map<string, number>;
  ambiguousDates: Set<string>;
  unknown: Map<string, Set<string>>;
  variants: Map<string, Map<string, string>>;
  header: Fault[];
}

export function decisionsOf(report: ReadinessReport): Decisions {
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

export const sentinelCount = (c: ColumnScan) => {
  let n = 0;
  for (const r of c.sentinels.values()) n += r.count;
  return n;
};

/**
 * The faults of field j of the row just read (value v): what moved in the column's counters
 * since `before` (six per column: missing, mismatch, comma, range, sentinels, ambiguous dates).
 */
export function columnFaults(
  c: ColumnScan,
  v: string,
  j: number,
  before: Float64Array,
  d: Decisions,
  faults: Fault[],
): void {
  const pc = c.plan;
  if (!pc || c.kind === "ignore") return;
  const b = before;
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
  else if (c.status === FieldStatus.Usable && d.suspected.get(name) === c.value) {
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
  if ((c.date.ambiguous?.count ?? 0) > b[6 * j + 5]! && d.ambiguousDates.has(name)) {
    faults.push({
      code: "date.ambiguous",
      column: name,
      message: `${quote(v)} could be day/month or month/day; write it as YYYY-MM-DD.`,
    });
  }
  if (c.status === FieldStatus.Usable && c.kind === "category") {
    const to = d.variants.get(name)?.get(v);
    if (to !== undefined)
      faults.push({
        code: "level.variant",
        column: name,
        message: `${quote(v)} is a spelling variant: write ${quote(to)}.`,
      });
    if (d.unknown.get(name)?.has(v))
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
