// GET /api/v1/admin/users[?limit=&cursor=] — every user, by role and name, a page at a time; POST — create one. Admins only.
import { apiRoute } from "@/lib/http/route";
import { parseJsonBody, parseQuery } from "@/lib/http/parse";
import { pageQuery } from "@/lib/http/queries";
import { decodeCursor, pageResponse } from "@/lib/http/page";
import { resultResponse } from "@/lib/http/respond";
import { listUsers, USER_LIST } from "@/lib/people/queries";
import { createUser } from "@/lib/people/commands-users";
import { createUserSchema } from "@/lib/people/schemas";

export const GET = apiRoute({ action: "user.manage" }, async ({ req, actor }) => {
  const { cursor, limit } = parseQuery(req, pageQuery);
  const after = decodeCursor(USER_LIST, cursor);
  return pageResponse(req, USER_LIST, await listUsers(actor, { after, limit }));
});

export const POST = apiRoute({ action: "user.manage" }, async ({ req, actor }) => {
  const input = await parseJsonBody(req, createUserSchema);
  return resultResponse(await createUser(actor.id, input), 201, (u) => `/api/v1/admin/users/${u.id}`);
});
