import "server-only";
import { eq } from "drizzle-orm";
import type { Tx } from "@/db/client";
import { organisations, studies } from "@/db/schema";
import { write } from "@/lib/core/write";
import { AppError } from "@/lib/errors";
import { fail, ok, type Result } from "@/lib/result";
import { studyRecordColumns, type StudySummary } from "./queries-detail";
import { createStudySchema, updateStudySchema } from "./schemas";

/** A study's own row (a StudySummary without the joined team name and the creation time). */
export type StudyRecord = Omit<StudySummary, "teamOrganisationName" | "createdAt">;

const SLUG_TAKEN = "Another study already uses this address; choose another.";
export const CHECK_MARKED = "Check the marked fields.";

/** The study row, locked for the rest of the transaction; AppError("not_found") when there is none. */
export async function lockStudy(tx: Tx, studyId: number): Promise<StudyRecord> {
  const rows = await tx
    .select(studyRecordColumns)
    .from(studies)
    .where(eq(studies.id, studyId))
    .for("update")
    .limit(1);
  const row = rows[0];
  if (!row) throw new AppError("not_found", "There is no such study.");
  return row;
}

async function organisationKind(tx: Tx, id: number) {
  const rows = await tx
    .select({ kind: organisations.kind })
    .from(organisations)
    .where(eq(organisations.id, id))
    .limit(1);
  return rows[0]?.kind ?? null;
}

/**
 * Creates a study without a data plan (publish version 1 from the plan editor). Admins and
 * leads (study.manage). The slug is the study's address and must be unique; the team is a
 * team organisation, by default the actor's own.
 */
export function createStudy(actorId: number, input: unknown): Promise<Result<StudyRecord>> {
  const taken = () => fail<StudyRecord>(CHECK_MARKED, { slug: [SLUG_TAKEN] }, "conflict");
  return write({
    name: "createStudy",
    actorId,
    may: "study.manage",
    schema: createStudySchema,
    input,
    invalid: CHECK_MARKED,
    // two people creating the same address at once: the unique key decides
    onDuplicate: taken,
    run: async ({ tx, actor, input: data, audit }) => {
      const existing = await tx
        .select({ id: studies.id })
        .from(studies)
        .where(eq(studies.slug, data.slug))
        .limit(1);
      if (existing.length > 0) return taken();

      let teamId = data.teamOrganisationId;
      if (teamId == null && actor.organisationId != null) {
        if ((await organisationKind(tx, actor.organisationId)) === "team") teamId = actor.organisationId;
      }
      if (teamId != null) {
        const kind = await organisationKind(tx, teamId);
        if (!kind) return fail(CHECK_MARKED, { teamOrganisationId: ["There is no such organisation."] });
        if (kind !== "team") {
          return fail(CHECK_MARKED, {
            teamOrganisationId: ["A study is run by a team organisation, not by a provider."],
          });
        }
      }
      const values = {
        slug: data.slug,
        title: data.title,
        description: data.description,
        teamOrganisationId: teamId,
      };
      const [created] = await tx
        .insert(studies)
        .values({ ...values, status: "open", createdById: actor.id })
        .$returningId();
      if (!created) throw new Error("insert into studies returned no id");
      const rec: StudyRecord = { id: created.id, ...values, status: "open", currentPlanVersion: null };
      await audit({
        action: "study.create",
        objectType: "study",
        objectId: rec.id,
        studyId: rec.id,
        before: null,
        after: rec,
      });
      return ok(rec);
    },
  });
}

/** Changes a study's title, description or status (open | closed). Admins and leads. */
export function updateStudy(actorId: number, studyId: number, input: unknown): Promise<Result<StudyRecord>> {
  return write({
    name: "updateStudy",
    actorId,
    may: "study.manage",
    schema: updateStudySchema,
    input,
    invalid: CHECK_MARKED,
    run: async ({ tx, input: change, audit }) => {
      const before = await lockStudy(tx, studyId);
      const after: StudyRecord = {
        ...before,
        ...(change.title !== undefined ? { title: change.title } : {}),
        ...(change.description !== undefined ? { description: change.description } : {}),
        ...(change.status !== undefined ? { status: change.status } : {}),
      };
      const fields = (s: StudyRecord) => ({ title: s.title, description: s.description, status: s.status });
      if (JSON.stringify(fields(after)) === JSON.stringify(fields(before))) return ok(before);
      await tx.update(studies).set(fields(after)).where(eq(studies.id, studyId));
      const statusAction = after.status === "closed" ? "study.close" : "study.reopen";
      await audit({
        action: after.status !== before.status ? statusAction : "study.update",
        objectType: "study",
        objectId: studyId,
        studyId,
        before: fields(before),
        after: fields(after),
      });
      return ok(after);
    },
  });
}
