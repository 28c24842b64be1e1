import "server-only";
import { and, asc, eq } from "drizzle-orm";
import { getReadDb as getDb } from "@/db/client";
import { studies } from "@/db/schema";
import { can } from "@/lib/auth/permissions";
import type { SessionUser } from "@/lib/auth/session";
import { studyScope } from "@/lib/studies";
import { z } from "zod";
import { write } from "@/lib/core/write";
import { unwrap } from "@/lib/errors";
import { ok } from "@/lib/result";
import {
  getIfAccepted,
  getStudyPool,
  STUDY_REF_COLUMNS,
  type IfAccepted,
  type StudyPool,
  type StudyRef,
} from "./pool";
import { getBoard, type Board } from "./queries-board";
import { sharedRead } from "@/lib/core/shared-read";

/**
 * The board and a study's pool answer every reader the same, and readers come in bursts (the
 * leads' boards refreshing together, a hundred analysts on one study): requests that arrive
 * while the same read runs on this instance share it (lib/core/shared-read.ts). Measured with
 * `npm run load -- --scale`: README, Scaling out.
 */
const sharedBoard = sharedRead((weeks: number) => getBoard(getDb(), new Date(), weeks));
/** the pool of one study at one plan version, shared the same way */
const readPool = sharedRead((study: StudyRef) => getStudyPool(getDb(), study), {
  keyOf: (study) => `${study.id}:${study.currentPlanVersion ?? ""}`,
});

/** A study the user may see the pool of (analysts: assigned studies; leads and admins: all), or null. */
export async function getPoolStudyForUser(user: SessionUser, slug: string): Promise<StudyRef | null> {
  if (!can(user.role, "pool.read")) return null;
  const scope = studyScope(user);
  const [s] = await getDb()
    .select(STUDY_REF_COLUMNS)
    .from(studies)
    .where(scope ? and(eq(studies.slug, slug), scope) : eq(studies.slug, slug));
  return s ?? null;
}

/** The studies whose pools the user may see, by title. */
export async function listPoolStudiesForUser(user: SessionUser): Promise<StudyRef[]> {
  if (!can(user.role, "pool.read")) return [];
  const scope = studyScope(user);
  return getDb().select(STUDY_REF_COLUMNS).from(studies).where(scope).orderBy(asc(studies.title));
}

export async function getPoolForUser(user: SessionUser, slug: string): Promise<StudyPool | null> {
  const study = await getPoolStudyForUser(user, slug);
  if (!study || study.currentPlanVersion == null) return null;
  return readPool(study);
}

/**
 * "If accepted" for a version, when the user may see the study's pool. The batch page already
 * checked the batch is visible; this checks the pool is too (providers never see a pool).
 */
export async function getIfAcceptedForUser(
  user: SessionUser,
  batchPublicId: string,
  version: number,
): Promise<IfAccepted | null> {
  if (!can(user.role, "pool.read")) return null;
  const r = await getIfAccepted(getDb(), batchPublicId, version);
  if (!r) return null;
  return (await getPoolStudyForUser(user, r.studySlug)) ? r : null;
}

const exportRequest = z.object({ what: z.enum(["rows", "dictionary"]), format: z.enum(["csv", "json"]) });

/** Audit row for a pool export: who took which versions' rows or the dictionary. Throws when refused. */
export async function recordPoolExport(
  actorId: number,
  pool: StudyPool,
  what: "rows" | "dictionary",
  format: "csv" | "json",
): Promise<void> {
  const done = await write({
    name: "recordPoolExport",
    actorId,
    may: "pool.read",
    schema: exportRequest,
    input: { what, format },
    run: async ({ input, audit }) => {
      await audit({
        action: `pool.export_${input.what}`,
        objectType: "study",
        objectId: pool.studyId,
        studyId: pool.studyId,
        after: {
          format: input.format,
          planVersion: pool.planVersion,
          rows: pool.report.rows.total,
          versions: pool.members.map((m) => ({ batch: m.batchPublicId, version: m.version })),
        },
      });
      return ok(null);
    },
  });
  unwrap(done);
}

/** The answer when a pool is not there or not the user's to see (the same words, so existence does not leak). */
export const NO_VISIBLE_POOL = "No study with this name has a pool you can see.";

/** The pool of a study already found in the user's scope (listPoolStudiesForUser). */
export function loadPool(study: StudyRef): Promise<StudyPool> {
  return readPool(study);
}

/**
 * The lead's board over the last `weeks` weeks; the caller has checked board.read. Without
 * `now` it is shared with the same board already being read on this instance.
 */
export function loadBoard(weeks: number, now?: Date): Promise<Board> {
  return now ? getBoard(getDb(), now, weeks) : sharedBoard(weeks);
}
