import "server-only";
import { eq } from "drizzle-orm";
import { getDb } from "@/db/client";
import { organisations, studies } from "@/db/schema";
import { AppError } from "@/lib/errors";
import { fail, fieldErrorsOf, ok, type Result } from "@/lib/result";
import { loadActor } from "@/lib/core/actor";
import { recordAudit, type Tx } from "@/lib/core/audit";
import { isDuplicateKey, runService } from "@/lib/core/write";
import { createStudySchema, updateStudySchema } from "./schemas";

export type StudyRecord = {
  id: number;
  slug: string;
  title: string;
  description: string | null;
  status: "open" | "closed";
  teamOrganisationId: number | null;
  currentPlanVersion: number | null;
};

const SLUG_TAKEN = "Another study already uses this address; choose another.";
const CHECK_FIELDS = "Check the marked fields.";

/** The study row, locked for the rest of the transaction; AppError("not_found") when there is none. */
export async function lockStudy(tx: Tx, studyId: number): Promise<StudyRecord> {
  const rows = await tx
    .select({
      id: studies.id,
      slug: studies.slug,
      title: studies.title,
      description: studies.description,
      status: studies.status,
      teamOrganisationId: studies.teamOrganisationId,
      currentPlanVersion: studies.currentPlanVersion,
    })
    .from(studies)
    .where(eq(studies.id, studyId))
    .for("update")
    .limit(1);
  const row = rows[0];
  if (!row) throw new AppError("not_found", "There is no such study.");
  return row;
}

/**
 * Creates a study without a data plan (publish version 1 from the plan editor). Admins and
 * leads (study.manage). The slug is the study's address and must be unique; the team is a
 * team organisation, by default the actor's own.
 */
export async function createStudy(actorId: number, input: unknown): Promise<Result<StudyRecord>> {
  return runService("createStudy", async () => {
    const parsed = createStudySchema.safeParse(input);
    if (!parsed.success) return fail(CHECK_FIELDS, fieldErrorsOf(parsed.error.issues));
    const data = parsed.data;
    const db = getDb();
    const actor = await loadActor(db, actorId, "study.manage");
    try {
      return await db.transaction(async (tx) => {
        const taken = await tx.select({ id: studies.id }).from(studies).where(eq(studies.slug, data.slug)).limit(1);
        if (taken.length > 0) return fail<StudyRecord>(CHECK_FIELDS, { slug: [SLUG_TAKEN] }, "conflict");

        let teamId = data.teamOrganisationId;
        if (teamId == null && actor.organisationId != null) {
          const own = await tx.select({ kind: organisations.kind }).from(organisations).where(eq(organisations.id, actor.organisationId)).limit(1);
          if (own[0]?.kind === "team") teamId = actor.organisationId;
        }
        if (teamId != null) {
          const org = await tx.select({ kind: organisations.kind }).from(organisations).where(eq(organisations.id, teamId)).limit(1);
          if (!org[0]) return fail<StudyRecord>(CHECK_FIELDS, { teamOrganisationId: ["There is no such organisation."] });
          if (org[0].kind !== "team")
            return fail<StudyRecord>(CHECK_FIELDS, { teamOrganisationId: ["A study is run by a team organisation, not by a provider."] });
        }
        const [created] = await tx
          .insert(studies)
          .values({ slug: data.slug, title: data.title, description: data.description, teamOrganisationId: teamId, status: "open", createdById: actor.id })
          .$returningId();
        if (!created) throw new Error("insert into studies returned no id");
        const rec: StudyRecord = {
          id: created.id,
          slug: data.slug,
          title: data.title,
          description: data.description,
          status: "open",
          teamOrganisationId: teamId,
          currentPlanVersion: null,
        };
        await recordAudit(tx, { actorId: actor.id, action: "study.create", objectType: "study", objectId: rec.id, studyId: rec.id, before: null, after: rec });
        return ok(rec);
      });
    } catch (e) {
      // two people creating the same address at once: the unique key decides
      if (isDuplicateKey(e)) return fail(CHECK_FIELDS, { slug: [SLUG_TAKEN] }, "conflict");
      throw e;
    }
  });
}

/** Changes a study's title, description or status (open | closed). Admins and leads. */
export async function updateStudy(actorId: number, studyId: number, input: unknown): Promise<Result<StudyRecord>> {
  return runService("updateStudy", async () => {
    const parsed = updateStudySchema.safeParse(input);
    if (!parsed.success) return fail(CHECK_FIELDS, fieldErrorsOf(parsed.error.issues));
    const change = parsed.data;
    const db = getDb();
    const actor = await loadActor(db, actorId, "study.manage");
    return db.transaction(async (tx) => {
      const before = await lockStudy(tx, studyId);
      const after: StudyRecord = {
        ...before,
        ...(change.title !== undefined ? { title: change.title } : {}),
        ...(change.description !== undefined ? { description: change.description } : {}),
        ...(change.status !== undefined ? { status: change.status } : {}),
      };
      if (after.title === before.title && after.description === before.description && after.status === before.status) return ok(before);
      await tx.update(studies).set({ title: after.title, description: after.description, status: after.status }).where(eq(studies.id, studyId));
      await recordAudit(tx, {
        actorId: actor.id,
        action: after.status !== before.status ? `study.${after.status === "closed" ? "close" : "reopen"}` : "study.update",
        objectType: "study",
        objectId: studyId,
        studyId,
        before: { title: before.title, description: before.description, status: before.status },
        after: { title: after.title, description: after.description, status: after.status },
      });
      return ok(after);
    });
  });
}
