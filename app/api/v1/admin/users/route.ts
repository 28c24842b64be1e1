// GET /api/v1/admin/users — every user; POST — create one. Admins only.
import { apiRoute } from "@/lib/http/route";
import { parseJsonBody } from "@/lib/http/parse";
import { jsonData, resultResponse } from "@/lib/http/respond";
import { listUsers } from "@/lib/people/queries";
import { createUser } from "@/lib/people/commands-users";
import { createUserSchema } from "@/lib/people/schemas";

export const GET = apiRoute({ action: "user.manage" }, async ({ actor }) => jsonData(await listUsers(actor)));

export const POST = apiRoute({ action: "user.manage" }, async ({ req, actor }) => {
  const input = await parseJsonBody(req, createUserSchema);
  return resultResponse(await createUser(actor.id, input), 201, (u) => `/api/v1/admin/users/${u.id}`);
});
