/** The printed figures and targets of `npm run load -- --scale` (scripts/load/scale-run.ts). */
import type { AfterChecks } from "./scale-checks";
import type { ScaleRecorder, UploadOutcome } from "./scale-traffic";
import { figureCells, ms, percentile, table, type Endpoint } from "./stats";

export interface FaultNote {
  name: string;
  at: number;
  what: string;
}

export const ENDPOINTS: Endpoint[] = ["upload", "queue", "report", "pool", "board", "sign-in"];
const READS: Endpoint[] = ["queue", "report", "pool", "board"];
const P95_TARGET_MS = 300;

export function printScale(r: {
  settings: Record<string, number>;
  rec: ScaleRecorder;
  outcomes: UploadOutcome[];
  faults: FaultNote[];
  after: AfterChecks;
  lag: { at: number; ms: number | null }[];
  signIn: { instances: Record<string, number>; refusedAfter: boolean; detail: string };
  reportsOpened: number;
  decided: number;
  windowS: number;
  uploadsS: number;
  checksS: number | null;
  /** when the last report was stored (the database's clock, as the after-run checks' times) */
  lastReportAt: Date | null;
  machine: string;
  /** when the first wave was sent (Date.now() clock) */
  startedAt: number;
}) {
  const s = r.settings;
  // the p95 targets are judged while the network is at work: from the first upload to the last
  // report or decision, whichever is later. The wait for a last e-mail after that adds only
  // quiet answers (the analysts then poll an empty queue), which would flatter the p95.
  const busyTo = Math.max(
    r.lastReportAt?.getTime() ?? -Infinity,
    r.after.lastDecisionAt?.getTime() ?? -Infinity,
  );
  const busy = READS.map((endpoint) => ({
    endpoint,
    ...r.rec.all.window(endpoint, r.startedAt, busyTo + 1),
  }));
  const busyS = Number.isFinite(busyTo) ? (busyTo - r.startedAt) / 1000 : null;
  const row = figureCells;
  const head = ["endpoint", "requests", "req/s", "p50", "p95", "p99", "max", "non-2xx", "socket errors"];
  const all = ENDPOINTS.map((e) => r.rec.all.figures(e)).filter((f) => f.requests > 0);
  const perInstance = [...r.rec.byInstance.entries()]
    .sort(([a], [b]) => a.localeCompare(b))
    .flatMap(([inst, rec]) =>
      ENDPOINTS.map((e) => rec.figures(e))
        .filter((f) => f.requests > 0)
        .map((f) => row(`${inst} ${f.endpoint}`, f)),
    );
  const lagMs = r.lag
    .filter((x) => x.ms !== null)
    .map((x) => x.ms!)
    .sort((a, b) => a - b);
  const accepted = r.outcomes.filter((o) => o.status === 201).length;
  const a = r.after;
  const retries =
    Object.entries(r.rec.retries)
      .map(([e, n]) => `${e} ${n}`)
      .join(", ") || "none";
  const targets = [
    {
      name: "no errors",
      met: r.rec.failures.length === 0 && accepted === s.batches,
      detail: `${r.rec.failures.length} requests failed every try; ${accepted}/${s.batches} uploads accepted; retried: ${retries}`,
    },
    {
      name: "every batch reported once",
      met: a.versions === s.batches && a.versionsWithoutOneReport === 0 && a.orgsWithMoreThanOneBatch === 0,
      detail: `${a.versions} versions of ${a.batches} batches; ${a.versionsWithoutOneReport} without exactly one report; ${a.orgsWithMoreThanOneBatch} providers with a second batch`,
    },
    ...busy.map((f) => {
      const whole = r.rec.all.figures(f.endpoint);
      return {
        name: `${f.endpoint} p95 < ${P95_TARGET_MS} ms while busy`,
        met: f.p95 !== null && f.p95 < P95_TARGET_MS,
        detail:
          f.p95 === null
            ? "no request measured"
            : `p95 ${ms(f.p95)} over ${f.requests} requests (whole run: ${ms(whole.p95)} over ${whole.requests})`,
      };
    }),
    {
      name: "sign-in limits counted across both instances",
      met:
        r.signIn.refusedAfter &&
        Object.keys(r.signIn.instances).filter((i) => i.startsWith("app-")).length === 2,
      detail: `10 wrong passwords answered by ${JSON.stringify(r.signIn.instances)}; the right one then ${r.signIn.refusedAfter ? "refused (TooManyAttempts)" : `not refused: ${r.signIn.detail}`}`,
    },
    {
      name: "every decision audited, no e-mail twice",
      met:
        a.decisionsWithoutAudit === 0 &&
        a.mailsSentTwice === 0 &&
        a.outboxSent === a.outboxRows &&
        a.decisions > 0,
      detail: `${a.decisions} decisions, ${a.decisionsWithoutAudit} without an audit row; ${a.outboxSent}/${a.outboxRows} e-mails sent, ${a.mailboxMessages} in the mailbox, ${a.mailsSentTwice} twice`,
    },
  ];
  const t0 = Math.min(...r.faults.map((f) => f.at), Date.now());
  const tail = (at: Date | null) =>
    at && r.lastReportAt
      ? `the last ${((at.getTime() - r.lastReportAt.getTime()) / 1000).toFixed(1)} s after the last report`
      : "the last: –";
  const lines = [
    `Tributary scale run: HAProxy → app-a, app-b (next start); 2 workers; MariaDB primary + 1 replica. ${s.batches} providers × ${s.rows!.toLocaleString("en")} rows in waves of ${s.wave}; ${s.analysts} analysts and ${s.leads} leads at ${s.rate} request/s each`,
    "",
    table(
      head,
      all.map((f) => row(f.endpoint, f)),
    ),
    "",
    `while busy: from the first upload to the last report or decision (${busyS === null ? "–" : `${busyS.toFixed(1)} s`}); the p95 targets are judged here`,
    table(
      ["endpoint", "requests", "p50", "p95", "p99"],
      busy
        .filter((f) => f.requests > 0)
        .map((f) => [f.endpoint, String(f.requests), ms(f.p50), ms(f.p95), ms(f.p99)]),
    ),
    "",
    'per instance (the X-Tributary-Instance header HAProxy sets; "none": HAProxy answered itself)',
    table(head, perInstance),
    "",
    `uploads accepted         ${accepted}/${s.batches} in ${r.uploadsS.toFixed(1)} s; whole window ${r.windowS.toFixed(1)} s`,
    `checks                   ${(s.batches! * s.rows!).toLocaleString("en")} rows, first upload → last report ${r.checksS === null ? "–" : `${r.checksS.toFixed(1)} s`}; ${a.checkJobsTakenOver} check jobs needed a second attempt`,
    `decisions                ${r.decided} made by the analysts (even providers accepted, odd bounced); ${tail(a.lastDecisionAt)}`,
    `e-mails                  ${a.outboxSent}/${a.outboxRows} sent, ${a.mailsRetried} needed a second attempt; ${tail(a.lastMailSentAt)}`,
    `reports opened           ${r.reportsOpened} distinct versions`,
    `replication lag          p50 ${ms(percentile(lagMs, 50))}, p95 ${ms(percentile(lagMs, 95))}, max ${ms(lagMs.at(-1) ?? null)} over ${lagMs.length} samples (${r.lag.length - lagMs.length} while a server was down)`,
    `machine                  ${r.machine}`,
    "",
    "faults",
    ...r.faults.map((f) => `  +${((f.at - t0) / 1000).toFixed(1).padStart(6)} s  ${f.name}: ${f.what}`),
    "",
    ...targets.map((t) => `${t.met ? "met   " : "MISSED"} ${t.name}: ${t.detail}`),
    ...r.rec.failures.slice(0, 5).map((f) => `  failed: ${f}`),
  ];
  console.log(`\n${lines.join("\n")}\n`);
  return {
    finishedAt: new Date().toISOString(),
    settings: s,
    figures: all,
    busy: { seconds: busyS, figures: busy },
    perInstance: Object.fromEntries(
      [...r.rec.byInstance].map(([i, rec]) => [i, ENDPOINTS.map((e) => rec.figures(e))]),
    ),
    retries: r.rec.retries,
    after: a,
    lagMs: { p50: percentile(lagMs, 50), p95: percentile(lagMs, 95), max: lagMs.at(-1) ?? null },
    faults: r.faults,
    machine: r.machine,
    targets,
    passed: targets.every((t) => t.met),
  };
}
