/** Zod schemas of the batches feature, shared by forms (browser), server actions and the writes. */
import { z } from "zod";

/** A comment on one finding of a version's report: in a decision, or a note before it. */
export const findingCommentInput = z.object({
  code: z.string().min(1, "Name the finding's code.").max(80),
  columns: z.array(z.string().max(200)).max(50).default([]),
  comment: z
    .string()
    .trim()
    .min(1, "A finding comment cannot be empty.")
    .max(2000, "Keep each finding comment under 2,000 characters."),
});
export type FindingCommentInput = z.input<typeof findingCommentInput>;

/**
 * An analyst's decision on a version: accept or bounce, with comments overall and per finding.
 * A bounce must say what to fix: an overall comment, a comment on a finding, or a note made on a
 * finding before the decision (the service checks, since the notes are in the database).
 */
export const decisionInput = z.object({
  decision: z.enum(["accept", "bounce"], { error: "Choose accept or bounce." }),
  comment: z.string().trim().max(5000, "Keep the comment under 5,000 characters.").default(""),
  findingComments: z.array(findingCommentInput).max(200).default([]),
});
/** The message of a bounce that says nothing the provider could act on. */
export const BOUNCE_NEEDS_COMMENT = "Say what the provider must fix: add a comment, overall or on a finding.";
export type DecisionInput = z.input<typeof decisionInput>;
