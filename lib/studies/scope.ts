import "server-only";
import { eq, inArray, sql, type SQL } from "drizzle-orm";
import { getDb } from "@/db/client";
import { batches, studies, studyAnalysts, studyProviders } from "@/db/schema";
import type { SessionUser } from "@/lib/auth/session";

// Matches nothing: a provider without an organisation sees no study and no batch.
const NOTHING = sql`1 = 0`;

/** WHERE condition on `studies` for the studies `user` may see (undefined = all). */
export function studyScope(user: SessionUser): SQL | undefined {
  const db = getDb();
  switch (user.role) {
    case "provider":
      if (user.organisationId == null) return NOTHING;
      return inArray(
        studies.id,
        db
          .select({ id: studyProviders.studyId })
          .from(studyProviders)
          .where(eq(studyProviders.organisationId, user.organisationId)),
      );
    case "analyst":
      return inArray(studies.id, analystStudyIds(user));
    case "lead":
    case "admin":
      return undefined;
  }
}

/** WHERE condition on `batches` for the batches `user` may see (undefined = all). */
export function batchScope(user: SessionUser): SQL | undefined {
  switch (user.role) {
    case "provider":
      // a provider sees its own organisation's batches and no other's
      if (user.organisationId == null) return NOTHING;
      return eq(batches.organisationId, user.organisationId);
    case "analyst":
      return inArray(batches.studyId, analystStudyIds(user));
    case "lead":
    case "admin":
      return undefined;
  }
}

/** The ids of the studies `user` is assigned to as an analyst (a subquery). */
function analystStudyIds(user: SessionUser) {
  return getDb()
    .select({ id: studyAnalysts.studyId })
    .from(studyAnalysts)
    .where(eq(studyAnalysts.userId, user.id));
}
