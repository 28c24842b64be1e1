import "server-only";
import { and, eq } from "drizzle-orm";
import { getReadDb as getDb } from "@/db/client";
import { batches, batchVersions } from "@/db/schema";
import { can } from "@/lib/auth/permissions";
import type { SessionUser } from "@/lib/auth/session";
import { getPoolStudyForUser } from "./queries";
import { getStudyRef, type StudyRef } from "./pool";
import {
  acceptedVersionIds,
  getIfAcceptedView,
  getPoolQuestionsView,
  type PoolNow,
  type QuestionsView,
} from "./questions";

async function poolNow(study: StudyRef): Promise<PoolNow> {
  return {
    planVersion: study.currentPlanVersion ?? 0,
    versionIds: (await acceptedVersionIds(getDb(), study.id)).get(study.id) ?? [],
  };
}

/** The stored pool questions of a study whose pool the user may see, or null. */
export async function getPoolQuestionsForUser(
  user: SessionUser,
  slug: string,
): Promise<{ study: StudyRef; view: QuestionsView } | null> {
  const study = await getPoolStudyForUser(user, slug);
  if (!study) return null;
  return { study, view: await getPoolQuestionsView(getDb(), study.id, await poolNow(study)) };
}

/**
 * The stored "if accepted" questions of a version ready for review, when the user may see
 * its study's pool (providers never do), or null.
 */
export async function getIfAcceptedQuestionsForUser(
  user: SessionUser,
  batchPublicId: string,
  version: number,
): Promise<{ study: StudyRef; view: QuestionsView } | null> {
  if (!can(user.role, "pool.read")) return null;
  const [v] = await getDb()
    .select({ id: batchVersions.id, state: batchVersions.state, studyId: batches.studyId })
    .from(batchVersions)
    .innerJoin(batches, eq(batches.id, batchVersions.batchId))
    .where(and(eq(batches.publicId, batchPublicId), eq(batchVersions.version, version)));
  if (!v || v.state !== "ready") return null;
  const ref = await getStudyRef(getDb(), { id: v.studyId });
  const study = ref ? await getPoolStudyForUser(user, ref.slug) : null;
  if (!study) return null;
  return { study, view: await getIfAcceptedView(getDb(), study.id, v.id, await poolNow(study)) };
}
