/**
 * The selection's terms from the plan: candidates (by name, or a bare count in older plans)
 * and the terms forced in, resolved against the treatment-coded design.
 */
import type { DesignTerm } from "../design";
import type { Plan } from "../plan";

export interface SelectionTerms {
  /** candidate terms in design order; empty when the plan only counts them */
  candidates: DesignTerm[];
  /** terms in every model: the required ones and every planned term not named a candidate */
  forced: DesignTerm[];
  /** the plan's `selection.required` list */
  required: string[];
}

/** Resolve the plan's selection lists against the design's terms; null without named candidates. */
export function selectionTerms(plan: Plan, terms: DesignTerm[]): SelectionTerms | null {
  const s = plan.selection;
  if (!s || !Array.isArray(s.candidates)) return null;
  const named = new Set(s.candidates);
  const candidates = terms.filter((t) => named.has(t.term));
  if (candidates.length === 0) return null;
  return { candidates, forced: terms.filter((t) => !named.has(t.term)), required: [...(s.required ?? [])] };
}

/**
 * The df budget of a planned selection: candidate parameters (a category's indicator columns
 * each count) and the number of subsets, 2^m for m candidate terms.
 */
export function selectionBudget(
  plan: Plan,
  terms: DesignTerm[],
): { candidates: number; subsets: number } | undefined {
  const s = plan.selection;
  if (!s) return undefined;
  if (!Array.isArray(s.candidates)) return { candidates: s.candidates, subsets: Math.pow(2, s.candidates) };
  const named = new Set(s.candidates);
  const picked = terms.filter((t) => named.has(t.term));
  return { candidates: picked.reduce((a, t) => a + t.df, 0), subsets: Math.pow(2, picked.length) };
}
