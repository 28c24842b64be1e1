// POST /api/v1/batches/:id/versions/:version/decision — accept or bounce a version, with an overall
// comment and comments per finding: the same service as the batch page (decideVersion).
import { apiRoute } from "@/lib/http/route";
import { parseJsonBody, parseParams } from "@/lib/http/parse";
import { batchVersionParams } from "@/lib/http/params";
import { resultResponse } from "@/lib/http/respond";
import { decideVersion } from "@/lib/batches/commands-decide";
import { decisionInput } from "@/lib/batches/schemas";

export const POST = apiRoute<{ id: string; version: string }>(
  { action: "batch.decide" },
  async ({ req, actor, params }) => {
    const { id, version } = parseParams(params, batchVersionParams);
    const input = await parseJsonBody(req, decisionInput);
    // the decision is part of the version's report answer (a decision has no address of its own)
    return resultResponse(
      await decideVersion(actor.id, id, version, input),
      201,
      () => `/api/v1/batches/${encodeURIComponent(id)}/versions/${version}/report`,
    );
  },
);
