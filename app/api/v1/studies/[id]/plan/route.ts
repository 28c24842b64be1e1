// GET /api/v1/studies/:id/plan — the study's current data plan (id = number or slug) with its version and hash; 404 outside the caller's scope.
import { apiRoute } from "@/lib/http/route";
import { parseParams } from "@/lib/http/parse";
import { studyParams } from "@/lib/http/params";
import { jsonData } from "@/lib/http/respond";
import { AppError } from "@/lib/errors";
import { getCurrentPlanForUser } from "@/lib/studies/queries";

export const GET = apiRoute<{ id: string }>({ action: "study.read" }, async ({ actor, params }) => {
  const { id } = parseParams(params, studyParams);
  const r = await getCurrentPlanForUser(actor, id);
  if (!r.found) throw new AppError("not_found", "No study with this id is visible to you.");
  if (!r.plan)
    throw new AppError(
      "not_found",
      "This study has no data plan yet; an admin or lead publishes version 1 on the study's plan page.",
    );
  return jsonData(r.plan);
});
