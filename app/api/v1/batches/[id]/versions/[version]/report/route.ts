// GET /api/v1/batches/:publicId/versions/:n/report — the version's readiness report (the engine's JSON format), or its progress while checking.
import { apiRoute } from "@/lib/http/route";
import { parseParams } from "@/lib/http/parse";
import { batchVersionParams } from "@/lib/http/params";
import { jsonData } from "@/lib/http/respond";
import { getVersionReportForUser, NO_VISIBLE_VERSION } from "@/lib/batches/queries-reports";
import { AppError } from "@/lib/errors";

export const GET = apiRoute<{ id: string; version: string }>(
  { action: "batch.read" },
  async ({ actor, params }) => {
    const { id, version } = parseParams(params, batchVersionParams);
    const found = await getVersionReportForUser(actor, id, version);
    if (!found) throw new AppError("not_found", NO_VISIBLE_VERSION);
    const v = found.version;
    return jsonData({
      batchId: found.batch.publicId,
      version: v.version,
      state: v.state,
      progress: { rows: v.progressRows, bytes: v.progressBytes, totalBytes: v.fileSize },
      planVersion: found.plan.version,
      reportedAt: found.reportedAt,
      report: found.report,
      decision: found.decision,
    });
  },
);
