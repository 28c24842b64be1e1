import "server-only";
import { and, count, eq } from "drizzle-orm";
import { getDb } from "@/db/client";
import {
  BATCH_STATES,
  batches,
  batchVersions,
  organisations,
  ROLES,
  studies,
  studyProviders,
  users,
  type BatchState,
  type UserRole,
} from "@/db/schema";
import type { SessionUser } from "@/lib/auth/session";
import { listBatchesForUser, type BatchSummary } from "./queries";
import { batchScope } from "@/lib/studies";
import { listStudiesForUser, type StudySummary } from "@/lib/studies";

export type StateCounts = Record<BatchState, number>;

export type ProviderHome = {
  role: "provider";
  organisation: { id: number; name: string } | null;
  studies: (StudySummary & { batchesByState: StateCounts })[];
  batchesByState: StateCounts;
  recentBatches: BatchSummary[];
};
export type AnalystHome = {
  role: "analyst";
  studies: (StudySummary & { batchesByState: StateCounts; readyForReview: number })[];
  readyForReview: number;
  queue: BatchSummary[];
};
export type LeadHome = {
  role: "lead";
  studies: (StudySummary & { batchesByState: StateCounts; providersAdmitted: number })[];
  batchesByState: StateCounts;
};
export type AdminHome = {
  role: "admin";
  usersByRole: Record<UserRole, number>;
  activeUsers: number;
  inactiveUsers: number;
  organisations: { provider: number; team: number };
  studies: number;
};
export type HomeSummary = ProviderHome | AnalystHome | LeadHome | AdminHome;

function emptyCounts(): StateCounts {
  return Object.fromEntries(BATCH_STATES.map((s) => [s, 0])) as StateCounts;
}

/** Counts of the user's visible batches by the state of their latest version, per study. */
async function stateCountsByStudy(user: SessionUser): Promise<Map<number, StateCounts>> {
  const rows = await getDb()
    .select({ studyId: batches.studyId, state: batchVersions.state, n: count() })
    .from(batches)
    .innerJoin(
      batchVersions,
      and(eq(batchVersions.batchId, batches.id), eq(batchVersions.version, batches.latestVersion)),
    )
    .where(batchScope(user))
    .groupBy(batches.studyId, batchVersions.state);
  const out = new Map<number, StateCounts>();
  for (const r of rows) {
    const c = out.get(r.studyId) ?? emptyCounts();
    c[r.state] += Number(r.n);
    out.set(r.studyId, c);
  }
  return out;
}

function sumCounts(all: Iterable<StateCounts>): StateCounts {
  const total = emptyCounts();
  for (const c of all) for (const s of BATCH_STATES) total[s] += c[s];
  return total;
}

/** How many batches awaiting review the analyst's home lists; the review queue pages through all. */
export const HOME_QUEUE_SHOWN = 20;

/** What the user's home page shows, shaped by role. */
export async function getHomeSummary(user: SessionUser): Promise<HomeSummary> {
  const db = getDb();
  switch (user.role) {
    case "provider": {
      const [studyList, counts, recentBatches] = await Promise.all([
        listStudiesForUser(user),
        stateCountsByStudy(user),
        listBatchesForUser(user, { limit: 10 }),
      ]);
      return {
        role: "provider",
        organisation:
          user.organisationId != null ? { id: user.organisationId, name: user.organisationName ?? "" } : null,
        studies: studyList.map((s) => ({ ...s, batchesByState: counts.get(s.id) ?? emptyCounts() })),
        batchesByState: sumCounts(counts.values()),
        recentBatches,
      };
    }
    case "analyst": {
      const [studyList, counts, queue] = await Promise.all([
        listStudiesForUser(user),
        stateCountsByStudy(user),
        listBatchesForUser(user, { state: "ready", limit: HOME_QUEUE_SHOWN }),
      ]);
      const withCounts = studyList.map((s) => {
        const c = counts.get(s.id) ?? emptyCounts();
        return { ...s, batchesByState: c, readyForReview: c.ready };
      });
      return {
        role: "analyst",
        studies: withCounts,
        readyForReview: withCounts.reduce((a, s) => a + s.readyForReview, 0),
        queue,
      };
    }
    case "lead": {
      const [studyList, counts, admitted] = await Promise.all([
        listStudiesForUser(user),
        stateCountsByStudy(user),
        db
          .select({ studyId: studyProviders.studyId, n: count() })
          .from(studyProviders)
          .groupBy(studyProviders.studyId),
      ]);
      const admittedBy = new Map(admitted.map((a) => [a.studyId, Number(a.n)]));
      return {
        role: "lead",
        studies: studyList.map((s) => ({
          ...s,
          batchesByState: counts.get(s.id) ?? emptyCounts(),
          providersAdmitted: admittedBy.get(s.id) ?? 0,
        })),
        batchesByState: sumCounts(counts.values()),
      };
    }
    case "admin": {
      const [byRole, orgKinds, studyCount] = await Promise.all([
        db
          .select({ role: users.role, active: users.active, n: count() })
          .from(users)
          .groupBy(users.role, users.active),
        db.select({ kind: organisations.kind, n: count() }).from(organisations).groupBy(organisations.kind),
        db.select({ n: count() }).from(studies),
      ]);
      const usersByRole = Object.fromEntries(ROLES.map((r) => [r, 0])) as Record<UserRole, number>;
      let activeUsers = 0;
      let inactiveUsers = 0;
      for (const r of byRole) {
        usersByRole[r.role] += Number(r.n);
        if (r.active) activeUsers += Number(r.n);
        else inactiveUsers += Number(r.n);
      }
      const orgCounts = { provider: 0, team: 0 };
      for (const o of orgKinds) orgCounts[o.kind] += Number(o.n);
      return {
        role: "admin",
        usersByRole,
        activeUsers,
        inactiveUsers,
        organisations: orgCounts,
        studies: Number(studyCount[0]?.n ?? 0),
      };
    }
  }
}
