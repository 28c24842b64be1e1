/**
 * Re-check a batch version against the study's newest data plan: the version is checked
 * again from its stored file, and its new report says which plan version it used.
 */
import { and, eq } from "drizzle-orm";
import type { Db } from "@/db/client";
import { batches, batchVersions, checkJobs, dataPlans, studies, studyAnalysts, users } from "@/db/schema";
import { can } from "@/lib/auth/permissions";
import { fail, ok, type Result } from "@/lib/result";
import { recordAudit } from "@/lib/services/audit";

export async function recheckVersion(db: Db, actorId: number, batchPublicId: string, versionNo: number): Promise<Result<{ planVersion: number }>> {
  return db.transaction(async (tx) => {
    const [actor] = await tx.select({ role: users.role, active: users.active }).from(users).where(eq(users.id, actorId));
    if (!actor?.active) return fail("Your account is not active. Sign in again.", undefined, "unauthenticated");
    if (!can(actor.role, "batch.decide")) return fail("Your role does not allow re-checking batches.", undefined, "forbidden");
    const [b] = await tx
      .select({ id: batches.id, studyId: batches.studyId, latest: batches.latestVersion, planVersion: studies.currentPlanVersion })
      .from(batches)
      .innerJoin(studies, eq(studies.id, batches.studyId))
      .where(eq(batches.publicId, batchPublicId));
    const notFound = fail<{ planVersion: number }>("No batch with this id is visible to you.", undefined, "not_found");
    if (!b) return notFound;
    if (actor.role === "analyst") {
      const [a] = await tx.select({ s: studyAnalysts.studyId }).from(studyAnalysts).where(and(eq(studyAnalysts.studyId, b.studyId), eq(studyAnalysts.userId, actorId)));
      if (!a) return notFound;
    }
    const [v] = await tx
      .select({ id: batchVersions.id, state: batchVersions.state, planId: batchVersions.planId })
      .from(batchVersions)
      .where(and(eq(batchVersions.batchId, b.id), eq(batchVersions.version, versionNo)))
      .for("update");
    if (!v) return notFound;
    if (versionNo !== b.latest || !(v.state === "ready" || v.state === "unreadable")) {
      return fail("Only the newest version, checked and not yet decided, can be re-checked.", undefined, "conflict");
    }
    const [plan] = await tx
      .select({ id: dataPlans.id, version: dataPlans.version })
      .from(dataPlans)
      .where(and(eq(dataPlans.studyId, b.studyId), eq(dataPlans.version, b.planVersion ?? 0)));
    if (!plan) return fail("The study has no current data plan.", undefined, "conflict");
    await tx.update(batchVersions).set({ state: "received", planId: plan.id, stateChangedAt: new Date(), progressRows: 0, progressBytes: 0 }).where(eq(batchVersions.id, v.id));
    await tx.insert(checkJobs).values({ batchVersionId: v.id });
    await recordAudit(tx, {
      actorId,
      action: "batch.recheck",
      objectType: "batch_version",
      objectId: v.id,
      studyId: b.studyId,
      batchId: b.id,
      before: { state: v.state, planId: v.planId },
      after: { state: "received", planId: plan.id, planVersion: plan.version },
    });
    return ok({ planVersion: plan.version });
  });
}
