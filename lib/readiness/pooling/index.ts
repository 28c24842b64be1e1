/**
 * The pool's own questions: can these batches be pooled, does anything predict, and which
 * model can the pool carry? All from the stored engine states. See README.md in this folder.
 */
import type { Plan } from "../plan";
import type { PoolMember, PoolQuestions, PoolQuestionsOptions } from "./types";

export * from "./types";
export { selectionTerms, selectionBudget, type SelectionTerms } from "./terms";

/**
 * Poolability, batch influence, the overall F test and the selection preview of a pool of
 * accepted batch versions (and of a version under review, `opts.candidate`, "if accepted").
 * Throws a RangeError with a plain message when a member's state does not fit the plan.
 */
export function poolQuestions(
  members: PoolMember[],
  plan: Plan,
  opts: PoolQuestionsOptions = {},
): PoolQuestions {
  void members;
  void plan;
  void opts;
  throw new Error("poolQuestions is being written on branch poolmath (types first)");
}
