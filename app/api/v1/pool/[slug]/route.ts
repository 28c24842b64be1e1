// GET /api/v1/pool/:slug — the study's pool: merged report of the accepted versions and the versions in it.
import { AppError } from "@/lib/errors";
import { parseParams } from "@/lib/http/parse";
import { poolParams } from "@/lib/http/params";
import { jsonData } from "@/lib/http/respond";
import { apiRoute } from "@/lib/http/route";
import { getPoolForUser, NO_VISIBLE_POOL, withoutState } from "@/lib/pool";

export const GET = apiRoute<{ slug: string }>({ action: "pool.read" }, async ({ actor, params }) => {
  const pool = await getPoolForUser(actor, parseParams(params, poolParams).slug);
  if (!pool) throw new AppError("not_found", NO_VISIBLE_POOL);
  return jsonData({
    study: { slug: pool.slug, title: pool.title, planVersion: pool.planVersion },
    report: withoutState(pool.report),
    members: pool.members.map(({ fileKey: _key, ...member }) => member),
  });
});
