// GET /api/v1/pool/:slug/if-accepted?batch=&version= — the pool's figures with a version ready for review added, and drift.
import { z } from "zod";
import { AppError } from "@/lib/errors";
import { parseParams, parseQuery } from "@/lib/http/parse";
import { poolParams } from "@/lib/http/params";
import { jsonData } from "@/lib/http/respond";
import { apiRoute } from "@/lib/http/route";
import { getIfAcceptedForUser, withoutState } from "@/lib/pool";

const query = z.object({
  batch: z.string().min(1, "batch is the batch's id.").max(32),
  version: z.coerce.number().int().positive("version is a positive whole number."),
});

export const GET = apiRoute<{ slug: string }>({ action: "pool.read" }, async ({ req, actor, params }) => {
  const { slug } = parseParams(params, poolParams);
  const q = parseQuery(req, query);
  const r = await getIfAcceptedForUser(actor, q.batch, q.version);
  if (!r || r.studySlug !== slug) {
    throw new AppError(
      "not_found",
      "No version ready for review with this id is visible to you in this study.",
    );
  }
  return jsonData({ ...r, before: withoutState(r.before), after: withoutState(r.after) });
});
