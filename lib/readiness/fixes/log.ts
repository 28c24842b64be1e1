/** The change log as CSV, and choosing proposals by code or id. */
import { csvCell } from "./csv-cell";
import { isFixCode, type FixChange, type FixProposal } from "./types";

/** The change log of a corrected file as CSV (formula-safe cells, CRLF): row, column, before, after, proposal. */
export function changeLogCsv(changes: readonly FixChange[]): string {
  const lines = [
    ["row", "column", "before", "after", "proposal"],
    ...changes.map((c) => [c.row, c.column, c.before, c.after, c.proposal]),
  ];
  return lines.map((l) => l.map(csvCell).join(",")).join("\r\n") + "\r\n";
}

/**
 * The proposals named by `only` (codes such as `level.variant`, or ids such as
 * `level.variant:soil`); all of them when `only` is absent. Unknown names are returned so the
 * caller can say what to fix.
 */
export function selectProposals(
  proposals: FixProposal[],
  only?: readonly string[],
): { chosen: FixProposal[]; unknown: string[] } {
  if (!only) return { chosen: proposals, unknown: [] };
  const unknown = only.filter((n) => !isFixCode(n) && !proposals.some((p) => p.id === n));
  return { chosen: proposals.filter((p) => only.includes(p.code) || only.includes(p.id)), unknown };
}
