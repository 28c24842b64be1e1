// GET /api/v1/batches/:publicId/versions/:n/changes — the change log of a machine-corrected version (row, column, before, after, proposal) as formula-safe CSV.
import { apiRoute } from "@/lib/http/route";
import { parseParams } from "@/lib/http/parse";
import { batchVersionParams } from "@/lib/http/params";
import { getVersionChangesForUser } from "@/lib/batches/queries-fixes";
import { AppError } from "@/lib/errors";
import { csvResponse } from "@/lib/http/respond";
import { changeLogCsv } from "@/lib/readiness";

export const GET = apiRoute<{ id: string; version: string }>(
  { action: "batch.read" },
  async ({ actor, params }) => {
    const { id, version } = parseParams(params, batchVersionParams);
    const got = await getVersionChangesForUser(actor, id, version);
    if (got === undefined)
      throw new AppError("not_found", "No batch version with this id is visible to you.");
    if (got === null)
      throw new AppError(
        "not_found",
        "This version was uploaded as it is, not made by applying fixes, so it has no change log.",
      );
    const base = got.fileName.replace(/\.[^.]+$/, "") || "batch";
    return csvResponse(changeLogCsv(got.changes), `${base}-v${got.version}-changes.csv`);
  },
);
