// GET /api/v1/batches/:publicId/versions/:n/rows-at-fault — the original rows that carry findings, with their codes and messages, as formula-safe CSV.
import { apiRoute } from "@/lib/http/route";
import { parseParams } from "@/lib/http/parse";
import { batchVersionParams } from "@/lib/http/params";
import { requireVersionFileForUser } from "@/lib/batches/queries-reports";
import { AppError } from "@/lib/errors";
import { csvResponse } from "@/lib/http/respond";
import { rowsAtFaultCsv } from "@/lib/batches/intake/rows-at-fault";
import { openStoredFile } from "@/lib/batches/intake/file-store";

export const GET = apiRoute<{ id: string; version: string }>(
  { action: "batch.read" },
  async ({ actor, params }) => {
    const { id, version } = parseParams(params, batchVersionParams);
    const { found, fileKey } = await requireVersionFileForUser(actor, id, version);
    if (!found.report)
      throw new AppError(
        "conflict",
        "This version has not been checked yet; its rows at fault are ready with its report.",
      );
    if (found.report.status === "unreadable")
      throw new AppError(
        "conflict",
        "This file could not be read, so it has no rows to list; see the report's finding for what to fix.",
      );
    const body = rowsAtFaultCsv({
      fileKey,
      plan: found.plan.plan,
      report: found.report,
      openFile: (k) => openStoredFile(k),
    });
    const base = found.version.fileName.replace(/\.[^.]+$/, "") || "batch";
    return csvResponse(body, `${base}-v${found.version.version}-rows-at-fault.csv`);
  },
);
