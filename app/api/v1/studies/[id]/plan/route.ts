// GET /api/v1/studies/:id/plan — the study's current data plan (id = number or slug) with its version and hash; 404 outside the caller's scope.
import { apiRoute } from "@/lib/http/route";
import { parseJsonBody, parseParams } from "@/lib/http/parse";
import { studyParams } from "@/lib/http/params";
import { jsonData, resultResponse } from "@/lib/http/respond";
import { studyInScope } from "@/lib/http/study";
import { publishPlanBody } from "@/lib/http/work-schemas";
import { publishPlanVersion } from "@/lib/studies";
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

// POST /api/v1/studies/:id/plan — publish the study's next data plan version (leads, admins):
// the same service as the plan editor; field errors carry the plan's dotted paths.
export const POST = apiRoute<{ id: string }>({ action: "plan.edit" }, async ({ req, actor, params }) => {
  const study = await studyInScope(actor, params);
  const input = await parseJsonBody(req, publishPlanBody);
  return resultResponse(
    await publishPlanVersion(actor.id, study.id, input.plan, input.note ?? ""),
    201,
    () => `/api/v1/studies/${study.slug}/plan`,
  );
});
