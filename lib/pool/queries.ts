import "server-only";
import { and, asc, eq } from "drizzle-orm";
import { getDb } from "@/db/client";
import { studies } from "@/db/schema";
import { can } from "@/lib/auth/permissions";
import type { SessionUser } from "@/lib/auth/session";
import { studyScope } from "@/lib/studies/scope";
import { recordAudit } from "@/lib/core/audit";
import { getIfAccepted, getStudyPool, type IfAccepted, type StudyPool, type StudyRef } from "./pool";

/** A study the user may see the pool of (analysts: assigned studies; leads and admins: all), or null. */
export async function getPoolStudyForUser(user: SessionUser, slug: string): Promise<StudyRef | null> {
  if (!can(user.role, "pool.read")) return null;
  const scope = studyScope(user);
  const [s] = await getDb()
    .select({ id: studies.id, slug: studies.slug, title: studies.title, currentPlanVersion: studies.currentPlanVersion })
    .from(studies)
    .where(scope ? and(eq(studies.slug, slug), scope) : eq(studies.slug, slug));
  return s ?? null;
}

/** The studies whose pools the user may see, by title. */
export async function listPoolStudiesForUser(user: SessionUser): Promise<StudyRef[]> {
  if (!can(user.role, "pool.read")) return [];
  const scope = studyScope(user);
  return getDb()
    .select({ id: studies.id, slug: studies.slug, title: studies.title, currentPlanVersion: studies.currentPlanVersion })
    .from(studies)
    .where(scope)
    .orderBy(asc(studies.title));
}

export async function getPoolForUser(user: SessionUser, slug: string): Promise<StudyPool | null> {
  const study = await getPoolStudyForUser(user, slug);
  if (!study || study.currentPlanVersion == null) return null;
  return getStudyPool(getDb(), study);
}

/**
 * "If accepted" for a version, when the user may see the study's pool. The batch page already
 * checked the batch is visible; this checks the pool is too (providers never see a pool).
 */
export async function getIfAcceptedForUser(user: SessionUser, batchPublicId: string, version: number): Promise<IfAccepted | null> {
  if (!can(user.role, "pool.read")) return null;
  const r = await getIfAccepted(getDb(), batchPublicId, version);
  if (!r) return null;
  return (await getPoolStudyForUser(user, r.studySlug)) ? r : null;
}

/** Audit row for a pool export: who took which versions' rows or the dictionary. */
export async function recordPoolExport(user: SessionUser, pool: StudyPool, what: "rows" | "dictionary", format: "csv" | "json"): Promise<void> {
  await recordAudit(getDb(), {
    actorId: user.id,
    action: `pool.export_${what}`,
    objectType: "study",
    objectId: pool.studyId,
    studyId: pool.studyId,
    after: {
      format,
      planVersion: pool.planVersion,
      rows: pool.report.rows.total,
      versions: pool.members.map((m) => ({ batch: m.batchPublicId, version: m.version })),
    },
  });
}
