import "server-only";
import { z } from "zod";
import { apiRoute } from "@/lib/http/route";
import { parseQuery } from "@/lib/http/parse";
import { jsonData } from "@/lib/http/respond";
import { AppError } from "@/lib/errors";
import { attachmentDisposition } from "@/lib/batches/intake/file-rules";
import { getIfAcceptedForUser, getPoolForUser, listPoolStudiesForUser, recordPoolExport } from "./queries";
import { dataDictionary, dataDictionaryCsv, poolCsvStream, type OpenFile } from "./export";
import { getStudyPool, withoutState } from "./pool";
import { getDb } from "@/db/client";

type SlugParams = { slug: string };

const notVisible = () => new AppError("not_found", "No study with this name has a pool you can see.");

const fileName = (slug: string, what: string, ext: string) => `${slug}-pool-${what}-${new Date().toISOString().slice(0, 10)}.${ext}`;

/** GET /api/v1/pool — each visible study's pool in brief. */
export const listPoolsHandler = apiRoute({ action: "pool.read" }, async ({ actor }) => {
  const out = [];
  for (const s of await listPoolStudiesForUser(actor)) {
    if (s.currentPlanVersion == null) continue;
    const p = await getStudyPool(getDb(), s);
    out.push({
      slug: s.slug,
      title: s.title,
      batches: p.members.length,
      rows: p.report.rows.total,
      completeCases: p.report.rows.complete,
      parameters: p.report.model.parameters,
      residualDf: p.report.model.residualDf,
      dfTarget: p.report.model.dfTarget,
      headroom: p.report.model.residualDf - p.report.model.dfTarget,
    });
  }
  return jsonData(out);
});

/** GET /api/v1/pool/:slug — the pool's merged report and its member versions. */
export const poolHandler = apiRoute<SlugParams>({ action: "pool.read" }, async ({ actor, params }) => {
  const pool = await getPoolForUser(actor, params.slug);
  if (!pool) throw notVisible();
  return jsonData({
    study: { slug: pool.slug, title: pool.title, planVersion: pool.planVersion },
    report: withoutState(pool.report),
    members: pool.members.map(({ fileKey: _k, ...m }) => (void _k, m)),
  });
});

/** GET /api/v1/pool/:slug/rows — every accepted row as CSV with provenance, streamed from the stored files. */
export function poolRowsHandler(openFile: OpenFile) {
  return apiRoute<SlugParams>({ action: "pool.read" }, async ({ actor, params }) => {
    const pool = await getPoolForUser(actor, params.slug);
    if (!pool) throw notVisible();
    await recordPoolExport(actor, pool, "rows", "csv");
    return new Response(poolCsvStream(pool, openFile), {
      headers: {
        "content-type": "text/csv; charset=utf-8",
        "content-disposition": attachmentDisposition(fileName(pool.slug, "rows", "csv")),
        "cache-control": "no-store",
        "x-pool-rows": String(pool.report.rows.total),
      },
    });
  });
}

const dictionaryQuery = z.object({ format: z.enum(["json", "csv"], { error: "format is json or csv." }).default("json") });

/** GET /api/v1/pool/:slug/dictionary[?format=csv] — the plan's columns with the pool's figures. */
export const dictionaryHandler = apiRoute<SlugParams>({ action: "pool.read" }, async ({ req, actor, params }) => {
  const pool = await getPoolForUser(actor, params.slug);
  if (!pool) throw notVisible();
  const { format } = parseQuery(req, dictionaryQuery);
  await recordPoolExport(actor, pool, "dictionary", format);
  const d = dataDictionary(pool);
  if (format === "json") return jsonData(d);
  return new Response(dataDictionaryCsv(d), {
    headers: {
      "content-type": "text/csv; charset=utf-8",
      "content-disposition": attachmentDisposition(fileName(pool.slug, "dictionary", "csv")),
      "cache-control": "no-store",
    },
  });
});

const ifAcceptedQuery = z.object({
  batch: z.string().min(1, "batch is the batch's id.").max(32),
  version: z.coerce.number().int().positive("version is a positive whole number."),
});

/** GET /api/v1/pool/:slug/if-accepted?batch=&version= — the pool with a version ready for review added, and its drift. */
export const ifAcceptedHandler = apiRoute<SlugParams>({ action: "pool.read" }, async ({ req, actor, params }) => {
  const q = parseQuery(req, ifAcceptedQuery);
  const r = await getIfAcceptedForUser(actor, q.batch, q.version);
  if (!r || r.studySlug !== params.slug) throw new AppError("not_found", "No version ready for review with this id is visible to you in this study.");
  return jsonData({ ...r, before: withoutState(r.before), after: withoutState(r.after) });
});
