// POST /api/v1/studies/:id/analysts — assign an analyst (body userId): the study page's service.
import { apiRoute } from "@/lib/http/route";
import { addStudyMember } from "@/lib/http/study-members";

export const POST = apiRoute<{ id: string }>({ action: "study.manage" }, ({ req, actor, params }) =>
  addStudyMember("analysts", req, actor, params),
);
