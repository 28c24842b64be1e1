/**
 * The weekly digest for leads: batches waiting for a decision, batches decided and bounced in
 * the week, and studies whose pool crossed or fell under its df target during the week.
 */
import { and, asc, eq, gte, lt } from "drizzle-orm";
import type { Db } from "@/db/client";
import { batches, batchVersions, decisions, organisations, studies } from "@/db/schema";
import { env } from "@/lib/env";
import { escapeHtml } from "@/lib/mail";
import { loadAccepted, loadCurrentPlan, poolOf, STUDY_REF_COLUMNS } from "@/lib/pool/pool";
import { countOf, formatCount } from "@/lib/format";

const DAY = 86_400_000;

export type DigestData = {
  from: Date;
  to: Date;
  waiting: {
    study: string;
    organisation: string;
    title: string;
    batchPublicId: string;
    version: number;
    since: Date;
  }[];
  accepted: number;
  bounced: { study: string; organisation: string; title: string; batchPublicId: string; version: number }[];
  pools: {
    slug: string;
    title: string;
    before: number;
    after: number;
    target: number;
    change: "crossed" | "fell" | "above" | "below";
  }[];
};

/** What happened in the 7 days up to `now`. */
export async function digestData(db: Db, now = new Date()): Promise<DigestData> {
  const from = new Date(now.getTime() - 7 * DAY);
  const waiting = await db
    .select({
      study: studies.title,
      organisation: organisations.name,
      title: batches.title,
      batchPublicId: batches.publicId,
      version: batchVersions.version,
      since: batchVersions.stateChangedAt,
    })
    .from(batchVersions)
    .innerJoin(batches, eq(batches.id, batchVersions.batchId))
    .innerJoin(studies, eq(studies.id, batches.studyId))
    .innerJoin(organisations, eq(organisations.id, batches.organisationId))
    .where(eq(batchVersions.state, "ready"))
    .orderBy(asc(batchVersions.stateChangedAt));
  const decided = await db
    .select({
      decision: decisions.decision,
      study: studies.title,
      organisation: organisations.name,
      title: batches.title,
      batchPublicId: batches.publicId,
      version: batchVersions.version,
    })
    .from(decisions)
    .innerJoin(batchVersions, eq(batchVersions.id, decisions.batchVersionId))
    .innerJoin(batches, eq(batches.id, batchVersions.batchId))
    .innerJoin(studies, eq(studies.id, batches.studyId))
    .innerJoin(organisations, eq(organisations.id, batches.organisationId))
    .where(and(gte(decisions.decidedAt, from), lt(decisions.decidedAt, now)))
    .orderBy(asc(decisions.decidedAt));
  const pools: DigestData["pools"] = [];
  const list = await db.select(STUDY_REF_COLUMNS).from(studies).orderBy(asc(studies.title));
  for (const s of list) {
    if (s.currentPlanVersion == null) continue;
    try {
      const { plan, planHash } = await loadCurrentPlan(db, s);
      const [then, nowPool] = await Promise.all([
        loadAccepted(db, s.id, planHash, from).then((l) => poolOf(l, plan)),
        loadAccepted(db, s.id, planHash, now).then((l) => poolOf(l, plan)),
      ]);
      const target = nowPool.model.dfTarget;
      const before = then.model.residualDf;
      const after = nowPool.model.residualDf;
      const change =
        before < target && after >= target
          ? "crossed"
          : before >= target && after < target
            ? "fell"
            : after >= target
              ? "above"
              : "below";
      pools.push({ slug: s.slug, title: s.title, before, after, target, change });
    } catch {
      // a study without a valid plan has no pool to report
    }
  }
  return {
    from,
    to: now,
    waiting,
    accepted: decided.filter((d) => d.decision === "accept").length,
    bounced: decided.filter((d) => d.decision === "bounce").map(({ decision: _d, ...b }) => (void _d, b)),
    pools,
  };
}

const esc = escapeHtml;
const day = (d: Date) => d.toISOString().slice(0, 10);
const days = (from: Date, to: Date) => Math.max(0, Math.floor((to.getTime() - from.getTime()) / DAY));

const POOL_WORDS = {
  crossed: "crossed its target this week",
  fell: "fell under its target this week",
  above: "is at or above its target",
  below: "is still under its target",
} as const;

/** Subject, plain text and HTML of the digest. */
export function composeDigest(
  d: DigestData,
  appUrl = env().APP_URL,
): { subject: string; text: string; html: string } {
  const base = appUrl.replace(/\/$/, "");
  const subject = `Tributary weekly digest ${day(d.from)} to ${day(d.to)}: ${d.waiting.length} waiting, ${d.accepted} accepted, ${d.bounced.length} bounced`;
  const lines: string[] = [
    `Intake from ${day(d.from)} to ${day(d.to)}.`,
    "",
    `Waiting for a decision: ${d.waiting.length}`,
    ...d.waiting.map(
      (w) =>
        `  - ${w.study} · ${w.organisation} · ${w.title} (version ${w.version}), waiting ${countOf(days(w.since, d.to), "day")}: ${base}/batches/${w.batchPublicId}?v=${w.version}`,
    ),
    "",
    `Decided this week: ${d.accepted} accepted, ${d.bounced.length} bounced`,
    ...d.bounced.map(
      (b) => `  - bounced: ${b.study} · ${b.organisation} · ${b.title} (version ${b.version})`,
    ),
    "",
    "Pools against their df targets:",
    ...d.pools.map(
      (p) =>
        `  - ${p.title} ${POOL_WORDS[p.change]}: residual df ${formatCount(p.before)} → ${formatCount(p.after)}, target ${formatCount(p.target)}. ${base}/pool/${p.slug}`,
    ),
    "",
    `The board: ${base}/board`,
  ];
  const li = (xs: string[]) => (xs.length ? `<ul>${xs.map((x) => `<li>${x}</li>`).join("")}</ul>` : "");
  const html = [
    `<p>Intake from ${day(d.from)} to ${day(d.to)}.</p>`,
    `<h2>Waiting for a decision: ${d.waiting.length}</h2>`,
    li(
      d.waiting.map(
        (w) =>
          `<a href="${esc(`${base}/batches/${w.batchPublicId}?v=${w.version}`)}">${esc(w.study)} · ${esc(w.organisation)} · ${esc(w.title)}</a> (version ${w.version}), waiting ${countOf(days(w.since, d.to), "day")}`,
      ),
    ),
    `<h2>Decided this week: ${d.accepted} accepted, ${d.bounced.length} bounced</h2>`,
    li(
      d.bounced.map(
        (b) => `bounced: ${esc(b.study)} · ${esc(b.organisation)} · ${esc(b.title)} (version ${b.version})`,
      ),
    ),
    `<h2>Pools against their df targets</h2>`,
    li(
      d.pools.map(
        (p) =>
          `<a href="${esc(`${base}/pool/${p.slug}`)}">${esc(p.title)}</a> ${POOL_WORDS[p.change]}: residual df ${formatCount(p.before)} → ${formatCount(p.after)}, target ${formatCount(p.target)}`,
      ),
    ),
    `<p><a href="${esc(`${base}/board`)}">Open the board</a></p>`,
  ].join("\n");
  return { subject, text: lines.join("\n") + "\n", html };
}
