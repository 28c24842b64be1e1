/**
 * Plays the demo's season (lib/demo/season-plan.ts) through the real services with the
 * services' clock (lib/core/clock.ts) set to each moment: the season's providers are admitted
 * and given sign-ins, every file goes to the upload service through the SDK and is recorded
 * as a batch version, checked by the worker's own job code, then accepted or bounced by the
 * study's analyst with comments (which queues the e-mails); the barley plan is republished once.
 * Nothing is typed into tables except the organisations, which the seed writes the same way.
 *
 * Run it before the worker starts (npm start and the e2e server do): a running worker would
 * take the season's check jobs at the wall clock's time. Idempotent: a season already built
 * (its first batch exists) is left alone.
 */
import { and, eq } from "drizzle-orm";
import { UTFile } from "uploadthing/server";
import type { Db } from "@/db/client";
import { batches, organisations, reports, batchVersions, studies, studyProviders, users } from "@/db/schema";
import { decideVersion } from "@/lib/batches/commands-decide";
import { recordBatchVersion } from "@/lib/batches/commands-upload";
import { openStoredFile, utapi } from "@/lib/batches/intake/file-store";
import { claimJob } from "@/lib/batches/jobs/check-jobs";
import { runJob } from "@/lib/batches/jobs/worker";
import { setClock } from "@/lib/core/clock";
import { createUser } from "@/lib/people/commands-users";
import type { Finding } from "@/lib/readiness";
import { admitProvider } from "@/lib/studies/commands-members";
import { publishPlanVersion } from "@/lib/studies/commands-plans";
import { DEMO_PASSWORD } from "./accounts";
import { BARLEY_PLAN } from "./plans";
import { SEASON_PROVIDERS } from "./season-cast";
import { seasonEvents, type SeasonDecision, type SeasonEvent, type SeasonVersion } from "./season-plan";
import { BOUNCE_WORDS, republishedBarley } from "./season-words";

const MINUTE = 60_000;

export type SeasonSummary = { versions: number; decisions: number; skipped: boolean; ms: number };

type Ids = { admin: number; lead: number; analyst: Record<string, number>; study: Record<string, number> };

async function idOf(db: Db, email: string): Promise<number> {
  const [u] = await db.select({ id: users.id }).from(users).where(eq(users.email, email));
  if (!u) throw new Error(`the demo user ${email} is not seeded; run db/seed.ts first`);
  return u.id;
}

/** The season's organisations, their sign-ins and their admission, a few days before week 0. */
async function castSeason(db: Db, ids: Ids, at: Date): Promise<void> {
  setClock(at);
  for (const p of SEASON_PROVIDERS) {
    await db
      .insert(organisations)
      .values({ slug: p.slug, name: p.name, kind: p.kind })
      .onDuplicateKeyUpdate({ set: { name: p.name } });
    const [org] = await db
      .select({ id: organisations.id })
      .from(organisations)
      .where(eq(organisations.slug, p.slug));
    if (!org) throw new Error(`organisation ${p.slug} is missing after the upsert`);
    const [user] = await db.select({ id: users.id }).from(users).where(eq(users.email, p.user.email));
    if (!user) {
      const r = await createUser(ids.admin, {
        ...p.user,
        role: "provider",
        organisationId: org.id,
        password: DEMO_PASSWORD,
      });
      if (!r.ok) throw new Error(`could not create ${p.user.email}: ${r.message}`);
    }
    const studyId = ids.study[p.studySlug]!;
    const [admitted] = await db
      .select({ id: studyProviders.organisationId })
      .from(studyProviders)
      .where(and(eq(studyProviders.studyId, studyId), eq(studyProviders.organisationId, org.id)));
    if (!admitted) {
      const r = await admitProvider(ids.lead, studyId, org.id);
      if (!r.ok) throw new Error(`could not admit ${p.name}: ${r.message}`);
    }
  }
}

async function batchOf(db: Db, e: { org: string; title: string }) {
  const [b] = await db
    .select({ id: batches.id, publicId: batches.publicId })
    .from(batches)
    .innerJoin(organisations, eq(organisations.id, batches.organisationId))
    .where(and(eq(organisations.slug, e.org), eq(batches.title, e.title)));
  return b ?? null;
}

async function upload(db: Db, ids: Ids, e: SeasonVersion, log: (l: string) => void): Promise<void> {
  const [uploader] = await db
    .select({ id: users.id })
    .from(users)
    .innerJoin(organisations, eq(organisations.id, users.organisationId))
    .where(and(eq(organisations.slug, e.org), eq(users.role, "provider"), eq(users.active, true)))
    .limit(1);
  if (!uploader) throw new Error(`${e.org} has no active provider user`);
  const previous = e.version > 1 ? await batchOf(db, e) : null;
  const bytes = new TextEncoder().encode(e.csv);
  const stored = await utapi().uploadFiles(new UTFile([bytes], e.fileName, { type: "text/csv" }), {
    acl: "private",
    contentDisposition: "attachment",
  });
  if (stored.error || !stored.data)
    throw new Error(`the upload service refused ${e.fileName}: ${stored.error?.message ?? "no answer"}`);
  const digest = Buffer.from(await crypto.subtle.digest("SHA-256", bytes)).toString("hex");
  const r = await recordBatchVersion(
    uploader.id,
    { studyId: ids.study[e.study]!, title: e.title, batchPublicId: previous?.publicId ?? null },
    { key: stored.data.key, url: stored.data.ufsUrl, name: e.fileName, size: bytes.length, hash: digest },
  );
  if (!r.ok) throw new Error(`${e.fileName} was not recorded: ${r.message}`);
  // the check starts a few minutes later, as the worker would take it
  setClock(new Date(e.at.getTime() + (2 + (r.data.batchVersionId % 5)) * MINUTE));
  const job = await claimJob(db, "demo-season");
  if (!job || job.batchVersionId !== r.data.batchVersionId)
    throw new Error(`the check job of ${e.fileName} was not the one in the queue; is a worker running?`);
  const report = await runJob({ db, openFile: openStoredFile, workerId: "demo-season", log }, job);
  if (!report) throw new Error(`the check of ${e.fileName} did not finish`);
}

async function decide(db: Db, ids: Ids, e: SeasonDecision): Promise<void> {
  const b = await batchOf(db, e);
  if (!b) throw new Error(`batch "${e.title}" is missing`);
  const [rep] = await db
    .select({ report: reports.report })
    .from(reports)
    .innerJoin(batchVersions, eq(batchVersions.id, reports.batchVersionId))
    .where(and(eq(batchVersions.batchId, b.id), eq(batchVersions.version, e.version)));
  const findings = ((rep?.report as { findings?: Finding[] } | undefined)?.findings ?? []).filter(
    (f) => f.severity !== "note",
  );
  const words = BOUNCE_WORDS[e.defect];
  const first = findings[0];
  const r = await decideVersion(ids.analyst[e.study]!, b.publicId, e.version, {
    decision: e.decision,
    comment: e.decision === "bounce" ? words.comment : "",
    findingComments:
      e.decision === "bounce" && first
        ? [{ code: first.code, columns: first.columns, comment: words.finding }]
        : [],
  });
  if (!r.ok) throw new Error(`could not ${e.decision} "${e.title}" version ${e.version}: ${r.message}`);
}

async function republish(ids: Ids, e: SeasonEvent & { kind: "plan" }): Promise<void> {
  const r = await publishPlanVersion(
    ids.lead,
    ids.study[e.study]!,
    republishedBarley(BARLEY_PLAN),
    "df target raised to 1,000 after the first month, to see a smaller nitrogen × soil difference",
  );
  if (!r.ok) throw new Error(`could not republish the ${e.study} plan: ${r.message}`);
}

/** Builds the season unless it is there already; the clock is back on the wall at the end. */
export async function buildSeason(
  db: Db,
  log: (line: string) => void = console.log,
  today = new Date(),
): Promise<SeasonSummary> {
  const started = Date.now();
  const events = seasonEvents(today);
  const uploads = events.filter((e): e is SeasonVersion => e.kind === "upload");
  if (uploads[0] && (await batchOf(db, uploads[0]))) {
    if (await batchOf(db, uploads[uploads.length - 1]!))
      return { versions: 0, decisions: 0, skipped: true, ms: Date.now() - started };
    throw new Error(
      "this database holds a season that was only partly built (an earlier run stopped); drop the demo database (bash scripts/db.sh drop-db tributary) and start again",
    );
  }

  const studyRows = await db.select({ id: studies.id, slug: studies.slug }).from(studies);
  const ids: Ids = {
    admin: await idOf(db, "admin@tributary.test"),
    lead: await idOf(db, "lead@lowmoor.test"),
    analyst: {
      "barley-nitrogen": await idOf(db, "analyst@lowmoor.test"),
      "heat-pump-savings": await idOf(db, "analyst2@lowmoor.test"),
    },
    study: Object.fromEntries(studyRows.map((s) => [s.slug, s.id])),
  };
  const quiet = () => undefined;
  let versions = 0;
  let decisions = 0;
  try {
    await castSeason(db, ids, new Date(events[0]!.at.getTime() - 3 * 24 * 60 * MINUTE));
    for (const e of events) {
      setClock(e.at);
      if (e.kind === "upload") {
        await upload(db, ids, e, quiet);
        versions++;
      } else if (e.kind === "decide") {
        await decide(db, ids, e);
        decisions++;
      } else await republish(ids, e);
    }
  } finally {
    setClock(null);
  }
  log(
    `season: ${versions} versions checked, ${decisions} decisions, 1 plan republished (${Date.now() - started} ms)`,
  );
  return { versions, decisions, skipped: false, ms: Date.now() - started };
}
