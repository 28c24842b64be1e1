// GET /api/v1/admin/users — every user; POST — create one. Admins only.
import { apiRoute } from "@/lib/api/route";
import { parseJsonBody } from "@/lib/api/parse";
import { jsonData, resultResponse } from "@/lib/api/respond";
import { listUsers } from "@/lib/dal/users";
import { createUser } from "@/lib/services/users";
import { createUserSchema } from "@/lib/validation/users";

export const GET = apiRoute({ action: "user.manage" }, async ({ actor }) => jsonData(await listUsers(actor)));

export const POST = apiRoute({ action: "user.manage" }, async ({ req, actor }) => {
  const input = await parseJsonBody(req, createUserSchema);
  return resultResponse(await createUser(actor.id, input), 201);
});
