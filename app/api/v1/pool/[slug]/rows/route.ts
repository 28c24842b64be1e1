// GET /api/v1/pool/:slug/rows — all accepted rows as one CSV with provenance columns, streamed; audited.
import { openStoredFile } from "@/lib/batches/intake/file-store";
import { AppError } from "@/lib/errors";
import { parseParams } from "@/lib/http/parse";
import { poolParams } from "@/lib/http/params";
import { csvResponse } from "@/lib/http/respond";
import { apiRoute } from "@/lib/http/route";
import { exportFileName, getPoolForUser, NO_VISIBLE_POOL, poolCsvStream, recordPoolExport } from "@/lib/pool";

export const GET = apiRoute<{ slug: string }>({ action: "pool.read" }, async ({ actor, params }) => {
  const pool = await getPoolForUser(actor, parseParams(params, poolParams).slug);
  if (!pool) throw new AppError("not_found", NO_VISIBLE_POOL);
  await recordPoolExport(actor.id, pool, "rows", "csv");
  return csvResponse(
    poolCsvStream(pool, (key) => openStoredFile(key)),
    exportFileName(pool.slug, "rows", "csv"),
    {
      "x-pool-rows": String(pool.report.rows.total),
    },
  );
});
