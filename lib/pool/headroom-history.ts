/**
 * A pool's residual df week by week: the complete cases of the versions accepted by the end of
 * each week (and not superseded by then), less the model's parameters and intercept under the
 * current plan. Complete cases add up across batches, so this is the pool's residual df as it
 * stood at each week's end, without merging the engine states again.
 */
import { and, desc, eq } from "drizzle-orm";
import type { Db } from "@/db/client";
import { batches, batchVersions, decisions, reports } from "@/db/schema";
import { HOUR_MS, weekStart } from "./board-stats";

export type HeadroomWeek = { week: string; residualDf: number };

export async function headroomByWeek(
  db: Db,
  studyId: number,
  fitted: number,
  opts: { weeks: number; now: Date },
): Promise<HeadroomWeek[]> {
  const rows = await db
    .select({
      versionId: batchVersions.id,
      decidedAt: decisions.decidedAt,
      state: batchVersions.state,
      stateChangedAt: batchVersions.stateChangedAt,
      complete: reports.completeCases,
    })
    .from(decisions)
    .innerJoin(batchVersions, eq(batchVersions.id, decisions.batchVersionId))
    .innerJoin(batches, eq(batches.id, batchVersions.batchId))
    .innerJoin(reports, eq(reports.batchVersionId, batchVersions.id))
    .where(and(eq(batches.studyId, studyId), eq(decisions.decision, "accept")))
    .orderBy(desc(reports.id));
  const newest = new Map<number, (typeof rows)[number]>();
  for (const r of rows) if (!newest.has(r.versionId)) newest.set(r.versionId, r);

  const first = weekStart(opts.now).getTime() - (opts.weeks - 1) * 7 * 24 * HOUR_MS;
  const out: HeadroomWeek[] = [];
  for (let i = 0; i < opts.weeks; i++) {
    const start = first + i * 7 * 24 * HOUR_MS;
    const end = Math.min(start + 7 * 24 * HOUR_MS, opts.now.getTime());
    let n = 0;
    for (const r of newest.values()) {
      const inPool =
        r.decidedAt.getTime() < end && (r.state === "accepted" || r.stateChangedAt.getTime() >= end);
      if (inPool) n += r.complete ?? 0;
    }
    out.push({ week: new Date(start).toISOString().slice(0, 10), residualDf: Math.max(0, n - fitted) });
  }
  return out;
}
