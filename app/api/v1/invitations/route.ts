// POST /api/v1/invitations — invite a provider or analyst (leads; admins any role): the account is
// made without a password and an e-mail link lets them choose one. The invite page's service.
import { apiRoute } from "@/lib/http/route";
import { parseJsonBody } from "@/lib/http/parse";
import { resultResponse } from "@/lib/http/respond";
import { invitationBody } from "@/lib/http/work-schemas";
import { clientIpOf } from "@/lib/auth/credentials";
import { createUser } from "@/lib/people/commands-users";

export const POST = apiRoute({ action: "user.invite" }, async ({ req, actor }) => {
  const input = await parseJsonBody(req, invitationBody);
  const r = await createUser(actor.id, { ...input, password: "" }, { ip: clientIpOf(req.headers) });
  return resultResponse(r, 201, (u) => `/api/v1/admin/users/${u.id}`);
});
