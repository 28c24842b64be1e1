import "server-only";
import { apiRoute } from "@/lib/http/route";
import { jsonData } from "@/lib/http/respond";
import { AppError } from "@/lib/errors";
import type { PoolQuestions } from "@/lib/readiness";
import type { StudyRef } from "./pool";
import type { QuestionsView } from "./questions";
import { getPoolQuestionsForUser } from "./questions-access";

type SlugParams = { slug: string };

const notVisible = () => new AppError("not_found", "No study with this name has a pool you can see.");

/** What every answer says about the stored figures: when, for what, and whether newer ones are coming. */
function about(study: StudyRef, view: QuestionsView) {
  const s = view.stored;
  return {
    study: { slug: study.slug, title: study.title, planVersion: study.currentPlanVersion },
    computedAt: s?.computedAt.toISOString() ?? null,
    planVersion: s?.planVersion ?? null,
    versionIds: s?.versionIds ?? [],
    recomputing: view.recomputing,
    outOfDate: view.outOfDate,
    error: s?.error ?? null,
  };
}

const findingsOf = (q: PoolQuestions | null, prefix: string) =>
  (q?.findings ?? []).filter((f) => f.code.startsWith(prefix));

/** A route answering the stored figures of a visible study's pool, shaped by `pick`. */
function storedRoute(pick: (q: PoolQuestions | null) => Record<string, unknown>) {
  return apiRoute<SlugParams>({ action: "pool.read" }, async ({ actor, params }) => {
    const found = await getPoolQuestionsForUser(actor, params.slug);
    if (!found) throw notVisible();
    return jsonData({ ...about(found.study, found.view), ...pick(found.view.stored?.result ?? null) });
  });
}

/**
 * GET /api/v1/pool/:slug/poolability — the stored answers to "can the batches be pooled?"
 * (Chow tests per batch, provider and the whole pool), batch influence and the overall F test.
 */
export const poolabilityHandler = storedRoute((q) => ({
  n: q?.n ?? null,
  parameters: q?.parameters ?? null,
  terms: q?.terms ?? [],
  overall: q?.overall ?? null,
  poolability: q?.poolability ?? null,
  influence: q?.influence ?? null,
  findings: findingsOf(q, "pool."),
}));

/** GET /api/v1/pool/:slug/selection — the stored selection preview over the plan's candidate terms, with its caution. */
export const selectionHandler = storedRoute((q) => ({
  n: q?.n ?? null,
  selection: q?.selection ?? null,
  caution: q?.caution ?? null,
  findings: findingsOf(q, "selection."),
}));
