/**
 * The JSON bodies of the v1 routes that do a role's work, built from the features' own schemas
 * (the ones their forms and services use), so the API checks what the pages check; the
 * OpenAPI document (openapi-routes-work.ts) describes them.
 */
import { z } from "zod";
import { createUserSchema } from "@/lib/people/schemas";
import { memberIdSchema, planNoteSchema } from "@/lib/studies/schemas";

/** POST /api/v1/studies/{id}/plan: the plan as JSON (the shape of REPORT-FORMAT.md's plan), and a note. */
export const publishPlanBody = z.object({
  plan: z
    .looseObject({})
    .meta({ description: "The data plan, as GET /api/v1/studies/{id}/plan answers it." }),
  note: planNoteSchema,
});

/** POST /api/v1/studies/{id}/providers */
export const admitProviderBody = z.object({ organisationId: memberIdSchema });

/** POST /api/v1/studies/{id}/analysts */
export const assignAnalystBody = z.object({ userId: memberIdSchema });

/** POST /api/v1/invitations: a person invited by e-mail (no password: they choose one through the link). */
export const invitationBody = createUserSchema.omit({ password: true });

/** A member of a study in the path: a provider organisation's or an analyst's id. */
export const studyMemberParams = z.object({
  id: z.string().min(1).max(100),
  memberId: memberIdSchema,
});

/** One comment on a finding, as GET …/finding-comments lists it and POST answers it. */
const findingCommentAnswer = z.object({
  id: z.number().int(),
  code: z.string().meta({ description: "The finding's code in the version's report." }),
  columns: z.array(z.string()),
  comment: z.string(),
  author: z.string(),
  createdAt: z.string().meta({ description: "ISO 8601, UTC." }),
});

/** GET /api/v1/batches/{id}/versions/{version}/finding-comments */
export const findingCommentsAnswer = z.array(
  findingCommentAnswer.extend({
    sent: z.boolean().meta({
      description: "True once a decision sent it to the provider; false for a note waiting for the decision.",
    }),
  }),
);

/** POST /api/v1/batches/{id}/versions/{version}/finding-comments */
export const findingNoteAnswer = findingCommentAnswer;
