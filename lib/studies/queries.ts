import "server-only";
import { and, asc, desc, eq, inArray } from "drizzle-orm";
import { getDb } from "@/db/client";
import { dataPlans, organisations, studies, studyAnalysts, studyProviders, users } from "@/db/schema";
import { can } from "@/lib/auth/permissions";
import type { SessionUser } from "@/lib/auth/session";
import { getStudyForUser, listStudiesForUser, type StudySummary } from "@/lib/studies/queries-detail";
import { studyScope } from "@/lib/studies/scope";

export type StudyListRow = StudySummary & { providers: string[]; analysts: string[] };

/**
 * The user's studies (lib/studies/queries-detail.ts scope) with the provider organisations and analysts
 * of each. A provider sees only its own organisation among the providers and no analysts.
 */
export async function listStudyRowsForUser(user: SessionUser): Promise<StudyListRow[]> {
  const list = await listStudiesForUser(user);
  if (list.length === 0) return [];
  const ids = list.map((s) => s.id);
  const db = getDb();
  const [provs, anas] = await Promise.all([
    db
      .select({ studyId: studyProviders.studyId, name: organisations.name })
      .from(studyProviders)
      .innerJoin(organisations, eq(organisations.id, studyProviders.organisationId))
      .where(
        user.role === "provider"
          ? and(
              inArray(studyProviders.studyId, ids),
              eq(studyProviders.organisationId, user.organisationId ?? 0),
            )
          : inArray(studyProviders.studyId, ids),
      )
      .orderBy(asc(organisations.name)),
    user.role === "provider"
      ? Promise.resolve([] as { studyId: number; name: string }[])
      : db
          .select({ studyId: studyAnalysts.studyId, name: users.name })
          .from(studyAnalysts)
          .innerJoin(users, eq(users.id, studyAnalysts.userId))
          .where(inArray(studyAnalysts.studyId, ids))
          .orderBy(asc(users.name)),
  ]);
  return list.map((s) => ({
    ...s,
    providers: provs.filter((p) => p.studyId === s.id).map((p) => p.name),
    analysts: anas.filter((a) => a.studyId === s.id).map((a) => a.name),
  }));
}

export type PlanVersionRow = {
  id: number;
  version: number;
  planHash: string;
  note: string | null;
  createdAt: Date;
  createdByName: string | null;
};

/** Every plan version of a study, newest first; empty when the study is outside the user's scope. */
export async function listPlanVersionsForUser(user: SessionUser, studyId: number): Promise<PlanVersionRow[]> {
  const db = getDb();
  const visible = await db
    .select({ id: studies.id })
    .from(studies)
    .where(and(eq(studies.id, studyId), studyScope(user)))
    .limit(1);
  if (visible.length === 0) return [];
  return db
    .select({
      id: dataPlans.id,
      version: dataPlans.version,
      planHash: dataPlans.planHash,
      note: dataPlans.note,
      createdAt: dataPlans.createdAt,
      createdByName: users.name,
    })
    .from(dataPlans)
    .leftJoin(users, eq(users.id, dataPlans.createdById))
    .where(eq(dataPlans.studyId, studyId))
    .orderBy(desc(dataPlans.version));
}

export type Option = { id: number; name: string; detail?: string };

/** Active analysts and provider organisations to choose from (study.manage only; empty otherwise). */
export async function listMembershipCandidates(
  user: SessionUser,
): Promise<{ analysts: Option[]; providers: Option[] }> {
  if (!can(user.role, "study.manage")) return { analysts: [], providers: [] };
  const db = getDb();
  const [analysts, providers] = await Promise.all([
    db
      .select({ id: users.id, name: users.name, detail: users.email })
      .from(users)
      .where(and(eq(users.role, "analyst"), eq(users.active, true)))
      .orderBy(asc(users.name)),
    db
      .select({ id: organisations.id, name: organisations.name })
      .from(organisations)
      .where(eq(organisations.kind, "provider"))
      .orderBy(asc(organisations.name)),
  ]);
  return { analysts, providers };
}

/** Team organisations that may run a study (study.manage only). */
export async function listTeamOrganisations(user: SessionUser): Promise<Option[]> {
  if (!can(user.role, "study.manage")) return [];
  return getDb()
    .select({ id: organisations.id, name: organisations.name })
    .from(organisations)
    .where(eq(organisations.kind, "team"))
    .orderBy(asc(organisations.name));
}

export type CurrentPlan = {
  studyId: number;
  slug: string;
  version: number;
  planHash: string;
  note: string | null;
  createdAt: Date;
  plan: unknown;
};

/**
 * A study's current data plan by numeric id or slug: null when the study is outside the user's
 * scope (lib/studies/queries-detail.ts getStudyForUser), or has no plan yet (`{ study }` without a plan).
 */
export async function getCurrentPlanForUser(
  user: SessionUser,
  idOrSlug: string | number,
): Promise<{ found: false } | { found: true; plan: CurrentPlan | null }> {
  const study = await getStudyForUser(user, idOrSlug);
  if (!study) return { found: false };
  if (!study.currentPlan) return { found: true, plan: null };
  const [row] = await getDb()
    .select({ planHash: dataPlans.planHash, note: dataPlans.note })
    .from(dataPlans)
    .where(eq(dataPlans.id, study.currentPlan.id))
    .limit(1);
  return {
    found: true,
    plan: {
      studyId: study.id,
      slug: study.slug,
      version: study.currentPlan.version,
      planHash: row?.planHash ?? "",
      note: row?.note ?? null,
      createdAt: study.currentPlan.createdAt,
      plan: study.currentPlan.plan,
    },
  };
}
