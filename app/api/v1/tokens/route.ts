// GET /api/v1/tokens[?limit=&cursor=] — the caller's API tokens, newest first, a page at a time; POST — create one (its value is shown once).
import { apiRoute } from "@/lib/http/route";
import { parseJsonBody, parseQuery } from "@/lib/http/parse";
import { pageQuery } from "@/lib/http/queries";
import { decodeCursor, pageResponse } from "@/lib/http/page";
import { resultResponse } from "@/lib/http/respond";
import { AppError } from "@/lib/errors";
import { createApiToken } from "@/lib/people";
import { listApiTokens, TOKEN_LIST } from "@/lib/people/queries";
import { createApiTokenSchema } from "@/lib/people/schemas";

export const GET = apiRoute({ action: "token.manage" }, async ({ req, actor }) => {
  const { cursor, limit } = parseQuery(req, pageQuery);
  const after = decodeCursor(TOKEN_LIST, cursor);
  return pageResponse(req, TOKEN_LIST, await listApiTokens(actor.id, { after, limit }));
});

export const POST = apiRoute({ action: "token.manage" }, async ({ req, actor }) => {
  // a token cannot mint further tokens: that takes a signed-in person
  if (actor.via === "token")
    throw new AppError("forbidden", "Create API tokens while signed in, not with another token.");
  const input = await parseJsonBody(req, createApiTokenSchema);
  return resultResponse(await createApiToken(actor.id, input), 201, (t) => `/api/v1/tokens/${t.id}`);
});
