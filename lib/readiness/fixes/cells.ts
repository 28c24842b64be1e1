/**
 * What a proposal does to one cell: the only place a value is changed. Counting (./propose.ts)
 * and rewriting (./rewrite.ts) both call it, so a proposal's count is the cells a rewrite changes.
 */
import { parseDate, readDecimalComma, readNumber, validYmd } from "../values";
import { formulaSafe } from "./csv-cell";
import type { FixCode, FixProposal, FixRule } from "./types";

/** The order in which a cell's proposals are tried; the first that changes the cell wins. */
const PRIORITY: FixCode[] = [
  "missing.token",
  "number.sentinel",
  "level.variant",
  "text.trim",
  "number.decimal-comma",
  "date.iso",
];

const DMY_LIKE = /^(\d{1,2})[/.-](\d{1,2})[/.-](\d{4})$/;
const pad = (n: number) => String(n).padStart(2, "0");

/** The number a cell holds, read with a point or a decimal comma; NaN otherwise. */
export function cellNumber(s: string): number {
  const v = readNumber(s);
  return v === v ? v : readDecimalComma(s);
}

/** A decimal-comma number rewritten with a point (`1.234,5` → `1234.5`); null when s is not one. */
export function commaToPoint(s: string): string | null {
  if (readNumber(s) === readNumber(s)) return null;
  if (readDecimalComma(s) !== readDecimalComma(s)) return null;
  return s.trim().replace(/\./g, "").replace(",", ".");
}

/** `d/m/yyyy` (or `m/d/yyyy`) as YYYY-MM-DD in the given order; null when the cell is not such a valid date. */
export function isoDate(s: string, order: "dmy" | "mdy"): string | null {
  const t = s.trim();
  if (parseDate(t).kind !== "pair") return null;
  const p = DMY_LIKE.exec(t);
  if (!p) return null; // two-digit years: the century is not certain
  const a = +p[1]!;
  const b = +p[2]!;
  const y = +p[3]!;
  const [d, m] = order === "dmy" ? [a, b] : [b, a];
  return validYmd(y, m, d) ? `${y}-${pad(m)}-${pad(d)}` : null;
}

/** The cell as `rule` writes it; null when the rule leaves it as it is. */
export function applyRule(rule: FixRule, s: string): string | null {
  switch (rule.kind) {
    case "map":
      return Object.prototype.hasOwnProperty.call(rule.values, s) ? rule.values[s]! : null;
    case "empty-tokens": {
      if (s === "") return null;
      return rule.tokens.includes(s) || rule.tokens.includes(s.trim()) ? "" : null;
    }
    case "empty-numbers": {
      const v = cellNumber(s);
      return v === v && rule.values.includes(v) ? "" : null;
    }
    case "trim": {
      if (rule.except.includes(s)) return null;
      const t = s.trim();
      return t !== s ? t : null;
    }
    case "decimal-comma":
      return commaToPoint(s);
    case "date":
      return isoDate(s, rule.order);
    case "rename":
      return null; // the header only (./rewrite.ts)
  }
}

export type CellFix = { after: string; proposal: string };

/** One rule as a function of the cell, never making a cell a formula where the original was safe. */
export function ruleFixer(rule: FixRule): (s: string) => string | null {
  return (s) => {
    const after = applyRule(rule, s);
    // never make a cell a spreadsheet would read as a formula when the original was safe
    return after !== null && after !== s && (formulaSafe(after) || !formulaSafe(s)) ? after : null;
  };
}

/** A column's proposals in priority order, as one function of the cell. */
export function columnFixer(proposals: FixProposal[]): (s: string) => CellFix | null {
  const ordered = proposals
    .filter((p) => p.rule.kind !== "rename")
    .sort((a, b) => PRIORITY.indexOf(a.code) - PRIORITY.indexOf(b.code))
    .map((p) => ({ id: p.id, fix: ruleFixer(p.rule) }));
  return (s) => {
    for (const p of ordered) {
      const after = p.fix(s);
      if (after !== null) return { after, proposal: p.id };
    }
    return null;
  };
}

/** Proposals grouped by the file column they change (header renames by the header's name). */
export function fixersByColumn(proposals: FixProposal[]): Map<string, (s: string) => CellFix | null> {
  const by = new Map<string, FixProposal[]>();
  for (const p of proposals) {
    if (p.rule.kind === "rename") continue;
    const l = by.get(p.column) ?? [];
    l.push(p);
    by.set(p.column, l);
  }
  return new Map([...by].map(([c, ps]) => [c, columnFixer(ps)]));
}
