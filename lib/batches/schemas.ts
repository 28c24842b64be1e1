/** Zod schemas of the batches feature, shared by forms (browser), server actions and the writes. */
import { z } from "zod";

/** An analyst's decision on a version: accept or bounce, with comments overall and per finding. */
export const decisionInput = z
  .object({
    decision: z.enum(["accept", "bounce"], { error: "Choose accept or bounce." }),
    comment: z.string().trim().max(5000, "Keep the comment under 5,000 characters.").default(""),
    findingComments: z
      .array(
        z.object({
          code: z.string().min(1).max(80),
          columns: z.array(z.string().max(200)).max(50).default([]),
          comment: z
            .string()
            .trim()
            .min(1, "A finding comment cannot be empty.")
            .max(2000, "Keep each finding comment under 2,000 characters."),
        }),
      )
      .max(200)
      .default([]),
  })
  .superRefine((v, ctx) => {
    if (v.decision === "bounce" && !v.comment && v.findingComments.length === 0) {
      ctx.addIssue({
        code: "custom",
        path: ["comment"],
        message: "Say what the provider must fix: add a comment, overall or on a finding.",
      });
    }
  });
export type DecisionInput = z.input<typeof decisionInput>;
