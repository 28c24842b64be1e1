/**
 * The lead's status board: where every batch stands and for how long, turnaround from
 * upload to decision by week, bounce rate and versions per batch by provider, the admitted
 * providers who have sent nothing, and each study's pool against its df target.
 * Plain functions of the database (no session): callers check `board.read` first.
 */
import { and, eq, gte, lte, sql } from "drizzle-orm";
import type { Db } from "@/db/client";
import {
  batches,
  batchVersions,
  dataPlans,
  decisions,
  organisations,
  studies,
  type BatchState,
} from "@/db/schema";
import { getStudyPool, poolFigures, type PoolFigures } from "@/lib/pool/pool";
import { HOUR_MS, quantile, weekStart } from "./board-stats";
import { storedFigures } from "./stored-read";
import { providerStats, silentProviders, type ProviderStats, type SilentProvider } from "./queries-providers";

export { providerStats, silentProviders, type ProviderStats, type SilentProvider };
import { headroomByWeek, type HeadroomWeek } from "./headroom-history";

export type BoardBatch = {
  studySlug: string;
  studyTitle: string;
  organisationName: string;
  batchPublicId: string;
  title: string;
  version: number;
  state: BatchState;
  uploadedAt: Date;
  stateChangedAt: Date;
  /** hours the newest version has sat in its state */
  hoursInState: number;
};

/** The newest version of every batch with its state and the time it has sat there. */
export async function listBoardBatches(db: Db, now = new Date()): Promise<BoardBatch[]> {
  const rows = await db
    .select({
      studySlug: studies.slug,
      studyTitle: studies.title,
      organisationName: organisations.name,
      batchPublicId: batches.publicId,
      title: batches.title,
      version: batchVersions.version,
      state: batchVersions.state,
      uploadedAt: batchVersions.uploadedAt,
      stateChangedAt: batchVersions.stateChangedAt,
    })
    .from(batches)
    .innerJoin(
      batchVersions,
      and(eq(batchVersions.batchId, batches.id), eq(batchVersions.version, batches.latestVersion)),
    )
    .innerJoin(studies, eq(studies.id, batches.studyId))
    .innerJoin(organisations, eq(organisations.id, batches.organisationId))
    .orderBy(studies.title, batchVersions.stateChangedAt);
  return rows.map((r) => ({
    ...r,
    hoursInState: Math.max(0, (now.getTime() - r.stateChangedAt.getTime()) / HOUR_MS),
  }));
}

export type TurnaroundWeek = {
  week: string;
  decisions: number;
  medianHours: number | null;
  p90Hours: number | null;
};

/**
 * Turnaround from a version's upload to its decision, by ISO week of the decision (UTC),
 * median and 90th percentile in hours (quantile type 7), over the last `weeks` weeks.
 */
export async function turnaroundByWeek(
  db: Db,
  opts: { weeks?: number; now?: Date; studySlug?: string } = {},
): Promise<{
  weeks: TurnaroundWeek[];
  overall: { decisions: number; medianHours: number | null; p90Hours: number | null };
}> {
  const now = opts.now ?? new Date();
  const weeks = opts.weeks ?? 12;
  const from = new Date(weekStart(now).getTime() - (weeks - 1) * 7 * 24 * HOUR_MS);
  const rows = await db
    .select({ uploadedAt: batchVersions.uploadedAt, decidedAt: decisions.decidedAt })
    .from(decisions)
    .innerJoin(batchVersions, eq(batchVersions.id, decisions.batchVersionId))
    .innerJoin(batches, eq(batches.id, batchVersions.batchId))
    .innerJoin(studies, eq(studies.id, batches.studyId))
    .where(
      and(
        gte(decisions.decidedAt, from),
        lte(decisions.decidedAt, now),
        opts.studySlug ? eq(studies.slug, opts.studySlug) : undefined,
      ),
    );
  const byWeek = new Map<string, number[]>();
  for (let i = 0; i < weeks; i++)
    byWeek.set(new Date(from.getTime() + i * 7 * 24 * HOUR_MS).toISOString().slice(0, 10), []);
  const all: number[] = [];
  for (const r of rows) {
    const h = Math.max(0, (r.decidedAt.getTime() - r.uploadedAt.getTime()) / HOUR_MS);
    all.push(h);
    byWeek.get(weekStart(r.decidedAt).toISOString().slice(0, 10))?.push(h);
  }
  return {
    weeks: [...byWeek].map(([week, hs]) => ({
      week,
      decisions: hs.length,
      medianHours: quantile(hs, 0.5),
      p90Hours: quantile(hs, 0.9),
    })),
    overall: { decisions: all.length, medianHours: quantile(all, 0.5), p90Hours: quantile(all, 0.9) },
  };
}

export type PoolHeadroom = PoolFigures & {
  studySlug: string;
  studyTitle: string;
  error?: string;
  history: HeadroomWeek[];
};

/**
 * Each study's pool against its df target (studies without a valid plan say why), with its
 * residual df at the end of each of the last `weeks` weeks.
 */
export async function poolHeadrooms(
  db: Db,
  opts: { weeks?: number; now?: Date } = {},
): Promise<PoolHeadroom[]> {
  const weeks = opts.weeks ?? 12;
  const now = opts.now ?? new Date();
  const [list, stored] = await Promise.all([
    db
      .select({
        id: studies.id,
        slug: studies.slug,
        title: studies.title,
        currentPlanVersion: studies.currentPlanVersion,
        intercept: sql<string | null>`json_value(${dataPlans.plan}, '$.intercept')`,
      })
      .from(studies)
      .leftJoin(
        dataPlans,
        and(eq(dataPlans.studyId, studies.id), eq(dataPlans.version, studies.currentPlanVersion)),
      )
      .orderBy(studies.title),
    storedFigures(db),
  ]);
  return Promise.all(
    list.map(async (s): Promise<PoolHeadroom> => {
      const named = { studySlug: s.slug, studyTitle: s.title };
      try {
        const row = stored.get(s.id);
        // the stored figures when they are for the current plan; merged afresh otherwise
        const figures: PoolFigures =
          row && row.planVersion === s.currentPlanVersion && s.intercept != null
            ? storedHeadroom(row)
            : poolFigures(await getStudyPool(db, s));
        const intercept = s.intercept === "true" || s.intercept === "1";
        const history = await headroomByWeek(db, s.id, figures.parameters + (intercept ? 1 : 0), {
          weeks,
          now,
        });
        return { ...named, ...figures, history };
      } catch (e) {
        const error = e instanceof Error ? e.message : "The pool could not be computed.";
        return { ...named, ...emptyFigures, history: [], error };
      }
    }),
  );
}

const emptyFigures: PoolFigures = {
  batches: 0,
  rows: 0,
  completeCases: 0,
  parameters: 0,
  residualDf: 0,
  dfTarget: 0,
  headroom: 0,
};

function storedHeadroom(
  row: NonNullable<ReturnType<Awaited<ReturnType<typeof storedFigures>>["get"]>>,
): PoolFigures {
  if (row.error) throw new RangeError(row.error);
  const { batches, rows, completeCases, parameters, residualDf, dfTarget } = row;
  return { batches, rows, completeCases, parameters, residualDf, dfTarget, headroom: residualDf - dfTarget };
}

export type IntakeFlow = { from: string; to: string; versions: number }[];

/**
 * How the versions uploaded between `since` and `until` moved between states: received → checking →
 * ready / unreadable → accepted / bounced / superseded, or still waiting where they are.
 * Derived from each version's state and decision (a superseded version counts as having
 * reached "ready" when it was checked).
 */
export async function intakeFlow(db: Db, since: Date, until = new Date()): Promise<IntakeFlow> {
  const rows = await db
    .select({ state: batchVersions.state, decision: decisions.decision })
    .from(batchVersions)
    .leftJoin(decisions, eq(decisions.batchVersionId, batchVersions.id))
    .where(and(gte(batchVersions.uploadedAt, since), lte(batchVersions.uploadedAt, until)));
  const flow = new Map<string, number>();
  const add = (from: string, to: string) => flow.set(`${from}>${to}`, (flow.get(`${from}>${to}`) ?? 0) + 1);
  for (const r of rows) {
    if (r.state === "received") continue;
    add("received", "checking");
    if (r.state === "checking") continue;
    if (r.state === "unreadable") {
      add("checking", "unreadable");
      continue;
    }
    add("checking", "ready");
    if (r.decision === "accept") add("ready", "accepted");
    else if (r.decision === "bounce") add("ready", "bounced");
    else if (r.state === "superseded") add("ready", "superseded");
  }
  return [...flow].map(([k, versions]) => {
    const [from, to] = k.split(">") as [string, string];
    return { from, to, versions };
  });
}

export type Board = {
  generatedAt: Date;
  batches: BoardBatch[];
  turnaround: Awaited<ReturnType<typeof turnaroundByWeek>>;
  providers: ProviderStats[];
  silent: SilentProvider[];
  pools: PoolHeadroom[];
  flow: IntakeFlow;
  /** versions received in the flow's period (including those not yet checked) */
  flowSince: Date;
  flowReceived: number;
};

/** Everything the board shows, in one call. */
export async function getBoard(db: Db, now = new Date(), weeks = 12): Promise<Board> {
  const flowSince = new Date(now.getTime() - weeks * 7 * 24 * HOUR_MS);
  const [list, turnaround, providers, silent, pools, flow, received] = await Promise.all([
    listBoardBatches(db, now),
    turnaroundByWeek(db, { weeks, now }),
    providerStats(db),
    silentProviders(db),
    poolHeadrooms(db, { weeks, now }),
    intakeFlow(db, flowSince, now),
    db
      .select({ n: sql<number>`count(*)` })
      .from(batchVersions)
      .where(and(gte(batchVersions.uploadedAt, flowSince), lte(batchVersions.uploadedAt, now))),
  ]);
  return {
    generatedAt: now,
    batches: list,
    turnaround,
    providers,
    silent,
    pools,
    flow,
    flowSince,
    flowReceived: Number(received[0]?.n ?? 0),
  };
}
