// DELETE /api/v1/tokens/:id — revoke one of the caller's API tokens.
import { apiRoute } from "@/lib/http/route";
import { parseParams } from "@/lib/http/parse";
import { idParams } from "@/lib/http/params";
import { resultResponse } from "@/lib/http/respond";
import { revokeApiToken } from "@/lib/people/commands-tokens";

const paramsSchema = idParams("A token id is a positive whole number.");

export const DELETE = apiRoute<{ id: string }>({ action: "token.manage" }, async ({ actor, params }) => {
  const { id } = parseParams(params, paramsSchema);
  return resultResponse(await revokeApiToken(actor.id, id));
});
