// GET /api/v1/studies/:id — one study (by id or slug) with its current data plan; 404 outside the caller's scope.
import { apiRoute } from "@/lib/http/route";
import { parseParams } from "@/lib/http/parse";
import { studyParams } from "@/lib/http/params";
import { jsonData } from "@/lib/http/respond";
import { getStudyForUser } from "@/lib/studies/queries-detail";
import { AppError } from "@/lib/errors";

export const GET = apiRoute<{ id: string }>({ action: "study.read" }, async ({ actor, params }) => {
  const { id } = parseParams(params, studyParams);
  const study = await getStudyForUser(actor, id);
  if (!study) throw new AppError("not_found", "No study with this id is visible to you.");
  return jsonData(study);
});
