// DELETE /api/v1/studies/:id/providers/:memberId — remove an admitted provider organisation: the study page's service.
import { apiRoute } from "@/lib/http/route";
import { removeStudyMember } from "@/lib/http/study-members";

export const DELETE = apiRoute<{ id: string; memberId: string }>(
  { action: "study.manage" },
  ({ actor, params }) => removeStudyMember("providers", actor, params),
);
