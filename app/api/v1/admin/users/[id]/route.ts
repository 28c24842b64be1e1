// PATCH /api/v1/admin/users/:id — change a user's role and/or active flag. Admins only.
import { z } from "zod";
import { apiRoute } from "@/lib/http/route";
import { parseJsonBody, parseParams } from "@/lib/http/parse";
import { resultResponse } from "@/lib/http/respond";
import { updateUser } from "@/lib/people/commands-users";
import { updateUserSchema, userIdSchema } from "@/lib/people/schemas";

const paramsSchema = z.object({ id: userIdSchema });

export const PATCH = apiRoute<{ id: string }>({ action: "user.manage" }, async ({ req, actor, params }) => {
  const { id } = parseParams(params, paramsSchema);
  const input = await parseJsonBody(req, updateUserSchema);
  return resultResponse(await updateUser(actor.id, id, input));
});
