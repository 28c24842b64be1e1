import "server-only";
import { and, asc, eq, inArray, ne } from "drizzle-orm";
import { getDb } from "@/db/client";
import { batches, batchVersions } from "@/db/schema";
import type { SessionUser } from "@/lib/auth/session";
import { batchScope } from "@/lib/studies";

/**
 * The next batch waiting for the user's decision after `exceptBatchId`: the latest version
 * awaiting review (or unreadable) that has waited longest, as the review queue orders it.
 * Null when nothing else waits in the user's scope.
 */
export async function getNextInQueueForUser(
  user: SessionUser,
  exceptBatchId: string,
): Promise<{ batchId: string; title: string } | null> {
  const rows = await getDb()
    .select({ batchId: batches.publicId, title: batches.title })
    .from(batches)
    .innerJoin(
      batchVersions,
      and(eq(batchVersions.batchId, batches.id), eq(batchVersions.version, batches.latestVersion)),
    )
    .where(
      and(
        batchScope(user),
        inArray(batchVersions.state, ["ready", "unreadable"]),
        ne(batches.publicId, exceptBatchId),
      ),
    )
    .orderBy(asc(batchVersions.stateChangedAt), asc(batches.id))
    .limit(1);
  return rows[0] ?? null;
}
