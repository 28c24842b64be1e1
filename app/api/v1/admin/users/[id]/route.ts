// PATCH /api/v1/admin/users/:id — change a user's role and/or active flag. Admins only.
import { z } from "zod";
import { apiRoute } from "@/lib/api/route";
import { parseJsonBody, parseParams } from "@/lib/api/parse";
import { resultResponse } from "@/lib/api/respond";
import { updateUser } from "@/lib/services/users";
import { updateUserSchema, userIdSchema } from "@/lib/validation/users";

const paramsSchema = z.object({ id: userIdSchema });

export const PATCH = apiRoute<{ id: string }>({ action: "user.manage" }, async ({ req, actor, params }) => {
  const { id } = parseParams(params, paramsSchema);
  const input = await parseJsonBody(req, updateUserSchema);
  return resultResponse(await updateUser(actor.id, id, input));
});
