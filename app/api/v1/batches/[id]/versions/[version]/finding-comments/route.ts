// GET /api/v1/batches/:id/versions/:version/finding-comments — the comments on the version's findings:
// notes waiting for the decision (analysts, leads, admins) and those sent with it (everyone who sees the batch).
// POST — a note on one finding before deciding `{ "code", "columns", "comment" }` (analysts, admins): the
// decision takes every note with it into the provider's e-mail.
import { apiRoute } from "@/lib/http/route";
import { parseJsonBody, parseParams } from "@/lib/http/parse";
import { batchVersionParams } from "@/lib/http/params";
import { jsonData, resultResponse } from "@/lib/http/respond";
import { AppError } from "@/lib/errors";
import { noteOnFinding } from "@/lib/batches/commands-finding-notes";
import { listFindingComments } from "@/lib/batches/queries-finding-notes";
import { NO_VISIBLE_VERSION } from "@/lib/batches/queries-reports";
import { findingCommentInput } from "@/lib/batches/schemas";

type Params = { id: string; version: string };

export const GET = apiRoute<Params>({ action: "batch.read" }, async ({ actor, params }) => {
  const { id, version } = parseParams(params, batchVersionParams);
  const comments = await listFindingComments(actor, id, version);
  if (!comments) throw new AppError("not_found", NO_VISIBLE_VERSION);
  return jsonData(comments);
});

export const POST = apiRoute<Params>({ action: "batch.decide" }, async ({ req, actor, params }) => {
  const { id, version } = parseParams(params, batchVersionParams);
  const input = await parseJsonBody(req, findingCommentInput);
  return resultResponse(
    await noteOnFinding(actor.id, id, version, input),
    201,
    () => `/api/v1/batches/${encodeURIComponent(id)}/versions/${version}/finding-comments`,
  );
});
