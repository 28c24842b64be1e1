// GET /api/v1/pool — each visible study's pool in brief.
import { jsonData } from "@/lib/http/respond";
import { apiRoute } from "@/lib/http/route";
import { listPoolStudiesForUser, loadPool, poolFigures } from "@/lib/pool";

export const GET = apiRoute({ action: "pool.read" }, async ({ actor }) => {
  const out = [];
  for (const s of await listPoolStudiesForUser(actor)) {
    if (s.currentPlanVersion == null) continue;
    const { batches, rows, completeCases, parameters, residualDf, dfTarget, headroom } = poolFigures(
      await loadPool(s),
    );
    out.push({
      slug: s.slug,
      title: s.title,
      batches,
      rows,
      completeCases,
      parameters,
      residualDf,
      dfTarget,
      headroom,
    });
  }
  return jsonData(out);
});
