// GET /api/v1/pool/:slug/dictionary[?format=csv] — the data dictionary (plan and pool figures); audited.
import { z } from "zod";
import { AppError } from "@/lib/errors";
import { parseParams, parseQuery } from "@/lib/http/parse";
import { poolParams } from "@/lib/http/params";
import { csvResponse, jsonData } from "@/lib/http/respond";
import { apiRoute } from "@/lib/http/route";
import {
  dataDictionary,
  dataDictionaryCsv,
  exportFileName,
  getPoolForUser,
  NO_VISIBLE_POOL,
  recordPoolExport,
} from "@/lib/pool";

const query = z.object({
  format: z.enum(["json", "csv"], { error: "format is json or csv." }).default("json"),
});

export const GET = apiRoute<{ slug: string }>({ action: "pool.read" }, async ({ req, actor, params }) => {
  const pool = await getPoolForUser(actor, parseParams(params, poolParams).slug);
  if (!pool) throw new AppError("not_found", NO_VISIBLE_POOL);
  const { format } = parseQuery(req, query);
  await recordPoolExport(actor.id, pool, "dictionary", format);
  const d = dataDictionary(pool);
  if (format === "json") return jsonData(d);
  return csvResponse(dataDictionaryCsv(d), exportFileName(pool.slug, "dictionary", "csv"));
});
