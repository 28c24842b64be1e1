// PATCH /api/v1/admin/users/:id — change a user's role and/or active flag. Admins only.
import { apiRoute } from "@/lib/http/route";
import { parseJsonBody, parseParams } from "@/lib/http/parse";
import { idParams } from "@/lib/http/params";
import { resultResponse } from "@/lib/http/respond";
import { updateUser } from "@/lib/people/commands-users";
import { updateUserSchema } from "@/lib/people/schemas";

const paramsSchema = idParams("A user id is a positive whole number.");

export const PATCH = apiRoute<{ id: string }>({ action: "user.manage" }, async ({ req, actor, params }) => {
  const { id } = parseParams(params, paramsSchema);
  const input = await parseJsonBody(req, updateUserSchema);
  return resultResponse(await updateUser(actor.id, id, input));
});
