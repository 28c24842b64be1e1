// DELETE /api/v1/tokens/:id — revoke one of the caller's API tokens.
import { z } from "zod";
import { apiRoute } from "@/lib/api/route";
import { parseParams } from "@/lib/api/parse";
import { resultResponse } from "@/lib/api/respond";
import { revokeApiToken } from "@/lib/services/api-tokens";
import { apiTokenIdSchema } from "@/lib/validation/api-tokens";

const paramsSchema = z.object({ id: apiTokenIdSchema });

export const DELETE = apiRoute<{ id: string }>({ action: "token.manage" }, async ({ actor, params }) => {
  const { id } = parseParams(params, paramsSchema);
  return resultResponse(await revokeApiToken(actor.id, id));
});
