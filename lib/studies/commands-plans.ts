import "server-only";
import { and, eq, max } from "drizzle-orm";
import { z } from "zod";
import { dataPlans, studies } from "@/db/schema";
import { write } from "@/lib/core/write";
import { enqueuePoolQuestions } from "@/lib/core/pool-questions-queue";
import { rebuildStoredPool } from "@/lib/pool";
import { hashPlan } from "@/lib/readiness";
import { parsePlan, type PlanIssue } from "@/lib/readiness";
import { fail, ok, type Result } from "@/lib/result";
import { lockStudy } from "./commands-studies";
import { planNoteSchema } from "./schemas";

export type PublishedPlan = {
  studyId: number;
  planId: number;
  version: number;
  planHash: string;
  note: string | null;
};

/**
 * The engine's plan issues as field errors keyed by their dotted path (`columns.3.baseline`,
 * `thresholds.vifWarning`), so the editor can show each next to its field; an issue about the
 * plan as a whole goes under `_form`.
 */
export function planFieldErrors(issues: readonly PlanIssue[]): Record<string, string[]> {
  const out: Record<string, string[]> = {};
  for (const i of issues) (out[i.path || "_form"] ??= []).push(i.message);
  return out;
}

const publishSchema = z.object({ plan: z.unknown(), note: planNoteSchema });

/**
 * Publishes a new version of a study's data plan and makes it current (plan.edit: admins and
 * leads). The plan is checked with the engine's schema (lib/readiness/plan.ts) and stored as
 * parsed, defaults filled in, with the engine's hashPlan; a plan equal to the current one is
 * refused. Batch versions keep the plan version they were checked against.
 */
export function publishPlanVersion(
  actorId: number,
  studyId: number,
  planInput: unknown,
  note?: unknown,
): Promise<Result<PublishedPlan>> {
  return write({
    name: "publishPlanVersion",
    actorId,
    may: "plan.edit",
    schema: publishSchema,
    input: { plan: planInput, note },
    invalid: (issues) => fail("Check the note.", { note: issues.map((i) => i.message) }),
    onDuplicate: () =>
      fail(
        "Someone published a plan version at the same moment; reload the page and try again.",
        undefined,
        "conflict",
      ),
    run: async ({ tx, actor, input, audit }) => {
      const parsed = parsePlan(input.plan);
      if (!parsed.ok) {
        const n = parsed.issues.length;
        const message = `The plan has ${n} problem${n === 1 ? "" : "s"}; each is shown next to its field. Fix them and publish again.`;
        return fail(message, planFieldErrors(parsed.issues));
      }
      const plan = parsed.plan;
      const hash = await hashPlan(plan);
      // the lock serialises publishers of the same study: version numbers never collide
      const study = await lockStudy(tx, studyId);
      let previous: { id: number; version: number; planHash: string } | null = null;
      if (study.currentPlanVersion != null) {
        const rows = await tx
          .select({ id: dataPlans.id, version: dataPlans.version, planHash: dataPlans.planHash })
          .from(dataPlans)
          .where(and(eq(dataPlans.studyId, studyId), eq(dataPlans.version, study.currentPlanVersion)))
          .limit(1);
        previous = rows[0] ?? null;
      }
      if (previous && previous.planHash === hash) {
        const message =
          `This plan is the same as the current version ${previous.version}; nothing would change. ` +
          "Edit the plan before publishing a new version.";
        return fail(message, undefined, "conflict");
      }
      const [top] = await tx
        .select({ v: max(dataPlans.version) })
        .from(dataPlans)
        .where(eq(dataPlans.studyId, studyId));
      const version = Number(top?.v ?? 0) + 1;
      const [created] = await tx
        .insert(dataPlans)
        .values({ studyId, version, plan, planHash: hash, note: input.note, createdById: actor.id })
        .$returningId();
      if (!created) throw new Error("insert into data_plans returned no id");
      await tx.update(studies).set({ currentPlanVersion: version }).where(eq(studies.id, studyId));
      // the stored pool merged again under the new plan, in the same transaction
      await rebuildStoredPool(tx, studyId);
      await enqueuePoolQuestions(tx, studyId);
      await audit({
        action: "plan.publish",
        objectType: "data_plan",
        objectId: created.id,
        studyId,
        before: previous ? { version: previous.version, planHash: previous.planHash } : null,
        after: { version, planHash: hash, note: input.note, columns: plan.columns.length },
      });
      return ok({ studyId, planId: created.id, version, planHash: hash, note: input.note });
    },
  });
}
