import "server-only";
import type { Result } from "@/lib/result";
import {
  admitProvider,
  assignAnalyst,
  removeProvider,
  unassignAnalyst,
  type Membership,
} from "@/lib/studies";
import { parseJsonBody, parseParams } from "./parse";
import { resultResponse } from "./respond";
import type { ApiActor } from "./route";
import { studyInScope } from "./study";
import { admitProviderBody, assignAnalystBody, studyMemberParams } from "./work-schemas";

type Kind = "providers" | "analysts";

/** POST /api/v1/studies/:id/{providers|analysts}: admit a provider organisation or assign an analyst (201). */
export async function addStudyMember(kind: Kind, req: Request, actor: ApiActor, params: unknown) {
  const study = await studyInScope(actor, params);
  let r: Result<Membership>;
  if (kind === "providers") {
    const { organisationId } = await parseJsonBody(req, admitProviderBody);
    r = await admitProvider(actor.id, study.id, organisationId);
  } else {
    const { userId } = await parseJsonBody(req, assignAnalystBody);
    r = await assignAnalyst(actor.id, study.id, userId);
  }
  return resultResponse(r, 201, (m) => `/api/v1/studies/${study.slug}/${kind}/${m.memberId}`);
}

/** DELETE /api/v1/studies/:id/{providers|analysts}/:memberId: remove the organisation or unassign the analyst. */
export async function removeStudyMember(kind: Kind, actor: ApiActor, params: unknown) {
  const study = await studyInScope(actor, params);
  const { memberId } = parseParams(params, studyMemberParams);
  const r =
    kind === "providers"
      ? await removeProvider(actor.id, study.id, memberId)
      : await unassignAnalyst(actor.id, study.id, memberId);
  return resultResponse(r);
}
