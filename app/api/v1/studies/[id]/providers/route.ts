// POST /api/v1/studies/:id/providers — admit a provider organisation (body organisationId): the study page's service.
import { apiRoute } from "@/lib/http/route";
import { addStudyMember } from "@/lib/http/study-members";

export const POST = apiRoute<{ id: string }>({ action: "study.manage" }, ({ req, actor, params }) =>
  addStudyMember("providers", req, actor, params),
);
