/**
 * The routes of the v1 API that do a role's work — decide a version (with comments per finding),
 * note on a finding before deciding,
 * create a study, publish a plan, admit and remove providers, assign and unassign analysts,
 * invite a person, change one's password — as the OpenAPI document describes them. Each calls
 * the same service as the page's server action.
 */
import { decisionInput, findingCommentInput } from "@/lib/batches/schemas";
import { changePasswordSchema } from "@/lib/people/schemas";
import { createStudySchema } from "@/lib/studies/schemas";
import type { Routes } from "./openapi-operation";
import { batchVersionParams, studyParams } from "./params";
import {
  admitProviderBody,
  assignAnalystBody,
  findingCommentsAnswer,
  findingNoteAnswer,
  invitationBody,
  publishPlanBody,
  studyMemberParams,
} from "./work-schemas";

const member = (what: string) => ({
  post: {
    summary: `${what === "providers" ? "Admit a provider organisation to" : "Assign an analyst to"} the study (leads, admins).`,
    tag: "studies",
    path: studyParams,
    json: what === "providers" ? admitProviderBody : assignAnalystBody,
    status: 201 as const,
    conflict: "Already a member of the study.",
  },
});

export const WORK_ROUTES: Routes = {
  "/api/v1/batches/{id}/versions/{version}/decision": {
    post: {
      summary:
        "Accept or bounce a version, with an overall comment and comments per finding (analysts, admins).",
      description:
        "A bounce needs a comment: overall, on a finding, or a note made on a finding before (POST …/finding-comments); each finding comment names a finding code of the version's report. The provider organisation is e-mailed, with every note.",
      tag: "batches",
      path: batchVersionParams,
      json: decisionInput,
      status: 201,
      conflict:
        "The version is already decided, has been superseded by a newer version, or its checks have not finished.",
    },
  },
  "/api/v1/batches/{id}/versions/{version}/finding-comments": {
    get: {
      summary:
        "The comments on the version's findings: notes waiting for the decision, and those sent with it.",
      description: "Providers see only the comments a decision sent them.",
      tag: "batches",
      path: batchVersionParams,
      data: findingCommentsAnswer,
    },
    post: {
      summary: "A note on one finding before deciding (analysts, admins).",
      description:
        "The code names a finding of the version's report. The decision sends every note with it to the provider, beside its own comments; the batch page shows the notes to the analysts meanwhile.",
      tag: "batches",
      path: batchVersionParams,
      json: findingCommentInput,
      data: findingNoteAnswer,
      status: 201,
      conflict: "The version is already decided or has been superseded by a newer version.",
    },
  },
  "/api/v1/studies": {
    post: {
      summary: "Create a study (leads, admins); publish its plan next.",
      tag: "studies",
      json: createStudySchema,
      status: 201,
      conflict: "A study with this slug exists.",
    },
  },
  "/api/v1/studies/{id}/plan": {
    post: {
      summary: "Publish the study's next data plan version (leads, admins).",
      tag: "studies",
      path: studyParams,
      json: publishPlanBody,
      status: 201,
      conflict: "Someone published a version at the same moment.",
    },
  },
  "/api/v1/studies/{id}/providers": member("providers"),
  "/api/v1/studies/{id}/providers/{memberId}": {
    delete: { summary: "Remove an admitted provider organisation.", tag: "studies", path: studyMemberParams },
  },
  "/api/v1/studies/{id}/analysts": member("analysts"),
  "/api/v1/studies/{id}/analysts/{memberId}": {
    delete: { summary: "Unassign an analyst from the study.", tag: "studies", path: studyMemberParams },
  },
  "/api/v1/invitations": {
    post: {
      summary: "Invite a provider or analyst by e-mail (leads; admins any role).",
      tag: "people",
      json: invitationBody,
      status: 201,
      conflict: "An account with this e-mail exists.",
    },
  },
  "/api/v1/me/password": {
    post: {
      summary: "Change one's own password; every earlier session ends.",
      tag: "people",
      json: changePasswordSchema,
    },
  },
};
