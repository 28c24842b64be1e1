// GET /api/v1/tokens — the caller's API tokens; POST — create one (its value is shown once).
import { apiRoute } from "@/lib/http/route";
import { parseJsonBody } from "@/lib/http/parse";
import { jsonData, resultResponse } from "@/lib/http/respond";
import { AppError } from "@/lib/errors";
import { createApiToken, listApiTokens } from "@/lib/people";
import { createApiTokenSchema } from "@/lib/people/schemas";

export const GET = apiRoute({ action: "token.manage" }, async ({ actor }) =>
  jsonData(await listApiTokens(actor.id)),
);

export const POST = apiRoute({ action: "token.manage" }, async ({ req, actor }) => {
  // a token cannot mint further tokens: that takes a signed-in person
  if (actor.via === "token")
    throw new AppError("forbidden", "Create API tokens while signed in, not with another token.");
  const input = await parseJsonBody(req, createApiTokenSchema);
  return resultResponse(await createApiToken(actor.id, input), 201, (t) => `/api/v1/tokens/${t.id}`);
});
