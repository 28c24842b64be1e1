// DELETE /api/v1/tokens/:id — revoke one of the caller's API tokens.
import { z } from "zod";
import { apiRoute } from "@/lib/http/route";
import { parseParams } from "@/lib/http/parse";
import { resultResponse } from "@/lib/http/respond";
import { revokeApiToken } from "@/lib/people/commands-tokens";
import { apiTokenIdSchema } from "@/lib/people/schemas-tokens";

const paramsSchema = z.object({ id: apiTokenIdSchema });

export const DELETE = apiRoute<{ id: string }>({ action: "token.manage" }, async ({ actor, params }) => {
  const { id } = parseParams(params, paramsSchema);
  return resultResponse(await revokeApiToken(actor.id, id));
});
