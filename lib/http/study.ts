import "server-only";
import type { SessionUser } from "@/lib/auth/session";
import { AppError } from "@/lib/errors";
import { getStudyForUser } from "@/lib/studies/queries-detail";
import { parseParams } from "./parse";
import { studyParams } from "./params";

/**
 * The study named in the path (number or slug) within the caller's scope, as the pages'
 * actions resolve it; outside the scope it answers 404 like one that does not exist.
 */
export async function studyInScope(
  actor: SessionUser,
  params: unknown,
): Promise<{ id: number; slug: string }> {
  const { id } = parseParams(params, studyParams.pick({ id: true }));
  const study = await getStudyForUser(actor, id);
  if (!study) throw new AppError("not_found", "No study with this id is visible to you.");
  return { id: study.id, slug: study.slug };
}
