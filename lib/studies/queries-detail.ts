import "server-only";
import { and, asc, eq } from "drizzle-orm";
import { getDb } from "@/db/client";
import { dataPlans, organisations, studies, studyAnalysts, studyProviders, users } from "@/db/schema";
import type { SessionUser } from "@/lib/auth/session";
import { studyScope } from "./scope";

export type StudySummary = {
  id: number;
  slug: string;
  title: string;
  description: string | null;
  status: "open" | "closed";
  teamOrganisationId: number | null;
  teamOrganisationName: string | null;
  currentPlanVersion: number | null;
  createdAt: Date;
};

export type StudyDetail = StudySummary & {
  /** the current data plan's JSON (validate with lib/readiness/plan.ts parsePlan) */
  currentPlan: { id: number; version: number; plan: unknown; createdAt: Date } | null;
  /** provider organisations admitted; a provider sees only its own */
  providers: { id: number; name: string; slug: string }[];
  /** assigned analysts; empty for providers */
  analysts: { id: number; name: string; email: string }[];
};

/** A study's own columns (StudyRecord); the writes lock rows with these. */
export const studyRecordColumns = {
  id: studies.id,
  slug: studies.slug,
  title: studies.title,
  description: studies.description,
  status: studies.status,
  teamOrganisationId: studies.teamOrganisationId,
  currentPlanVersion: studies.currentPlanVersion,
};

const studyColumns = {
  ...studyRecordColumns,
  teamOrganisationName: organisations.name,
  createdAt: studies.createdAt,
};

/** Studies the user may see: a provider's admitted ones, an analyst's assigned ones, all for leads and admins. */
export async function listStudiesForUser(user: SessionUser): Promise<StudySummary[]> {
  return getDb()
    .select(studyColumns)
    .from(studies)
    .leftJoin(organisations, eq(organisations.id, studies.teamOrganisationId))
    .where(studyScope(user))
    .orderBy(asc(studies.title));
}

/** One study by numeric id or slug, or null when it does not exist or is outside the user's scope. */
export async function getStudyForUser(
  user: SessionUser,
  idOrSlug: number | string,
): Promise<StudyDetail | null> {
  const db = getDb();
  const key =
    typeof idOrSlug === "number" || /^\d+$/.test(idOrSlug)
      ? eq(studies.id, Number(idOrSlug))
      : eq(studies.slug, String(idOrSlug));
  const rows = await db
    .select(studyColumns)
    .from(studies)
    .leftJoin(organisations, eq(organisations.id, studies.teamOrganisationId))
    .where(and(key, studyScope(user)))
    .limit(1);
  const study = rows[0];
  if (!study) return null;

  const [plans, providers, analysts] = await Promise.all([
    study.currentPlanVersion == null
      ? Promise.resolve([])
      : db
          .select({
            id: dataPlans.id,
            version: dataPlans.version,
            plan: dataPlans.plan,
            createdAt: dataPlans.createdAt,
          })
          .from(dataPlans)
          .where(and(eq(dataPlans.studyId, study.id), eq(dataPlans.version, study.currentPlanVersion)))
          .limit(1),
    db
      .select({ id: organisations.id, name: organisations.name, slug: organisations.slug })
      .from(studyProviders)
      .innerJoin(organisations, eq(organisations.id, studyProviders.organisationId))
      .where(
        user.role === "provider"
          ? and(
              eq(studyProviders.studyId, study.id),
              eq(studyProviders.organisationId, user.organisationId ?? 0),
            )
          : eq(studyProviders.studyId, study.id),
      )
      .orderBy(asc(organisations.name)),
    user.role === "provider"
      ? Promise.resolve([])
      : db
          .select({ id: users.id, name: users.name, email: users.email })
          .from(studyAnalysts)
          .innerJoin(users, eq(users.id, studyAnalysts.userId))
          .where(eq(studyAnalysts.studyId, study.id))
          .orderBy(asc(users.name)),
  ]);
  return { ...study, currentPlan: plans[0] ?? null, providers, analysts };
}
