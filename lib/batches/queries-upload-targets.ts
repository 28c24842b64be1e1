import "server-only";
import { and, eq } from "drizzle-orm";
import { getDb } from "@/db/client";
import { dataPlans, studies, studyProviders } from "@/db/schema";
import type { SessionUser } from "@/lib/auth/session";

export type UploadTarget = { slug: string; title: string; planVersion: number; plan: unknown };

/** The open studies a provider may send batches to, each with its current data plan. */
export async function listUploadTargets(user: SessionUser): Promise<UploadTarget[]> {
  if (user.role !== "provider" || user.organisationId == null) return [];
  const rows = await getDb()
    .select({
      slug: studies.slug,
      title: studies.title,
      planVersion: dataPlans.version,
      plan: dataPlans.plan,
    })
    .from(studies)
    .innerJoin(
      studyProviders,
      and(eq(studyProviders.studyId, studies.id), eq(studyProviders.organisationId, user.organisationId)),
    )
    .innerJoin(
      dataPlans,
      and(eq(dataPlans.studyId, studies.id), eq(dataPlans.version, studies.currentPlanVersion)),
    )
    .where(eq(studies.status, "open"))
    .orderBy(studies.title);
  return rows;
}
