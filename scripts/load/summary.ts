/** The printed table of a load run, its targets, and the JSON kept in .data/load/last.json. */
import type { LoopFigures } from "./loop";
import type { CheckProgress } from "./progress";
import { figureCells, ms, table, type EndpointFigures } from "./stats";
import type { UploadOutcome } from "./traffic";

export interface RunSettings {
  providers: number;
  rows: number;
  analysts: number;
  analystRate: number;
  workers: number;
  p95TargetMs: number;
}

export interface PhaseFigures {
  name: string;
  seconds: number;
  queue: { requests: number; p50: number | null; p95: number | null; p99: number | null };
  report: { requests: number; p50: number | null; p95: number | null; p99: number | null };
}

export interface Target {
  name: string;
  met: boolean;
  detail: string;
}

const LABEL: Record<string, string> = {
  upload: "POST /api/v1/batches",
  queue: "GET  /api/v1/queue",
  report: "GET  /api/v1/batches/:id/versions/:v/report",
};

const secs = (ms: number | null) => (ms === null ? "–" : `${(ms / 1000).toFixed(1)} s`);

/** Time from the last accepted upload to the last stored report (server clock), in ms. */
export function lastUploadToLastReport(p: CheckProgress): number | null {
  return p.lastUploadAt && p.lastReportAt ? p.lastReportAt.getTime() - p.lastUploadAt.getTime() : null;
}

/** The targets of issue 7: no errors, every batch reported, queue and report p95 under the limit. */
export function evaluate(
  s: RunSettings,
  figs: EndpointFigures[],
  uploads: UploadOutcome[],
  p: CheckProgress,
): Target[] {
  const errors = figs.reduce((n, f) => n + f.non2xx + f.socketErrors, 0);
  const accepted = uploads.filter((u) => u.status === 201).length;
  const targets: Target[] = [
    {
      name: "no errors",
      met: errors === 0 && accepted === s.providers,
      detail: `${errors} non-2xx answers or socket errors; ${accepted}/${s.providers} uploads accepted`,
    },
    {
      name: "every batch reported",
      met: p.versions === s.providers && p.reported === s.providers,
      detail: `${p.reported}/${s.providers} batches have a stored report (${p.ready} ready for review, ${p.unreadable} unreadable)`,
    },
  ];
  for (const e of ["queue", "report"] as const) {
    const f = figs.find((x) => x.endpoint === e);
    const p95 = f?.p95 ?? null;
    targets.push({
      name: `${e} p95 < ${s.p95TargetMs} ms`,
      met: p95 !== null && p95 < s.p95TargetMs,
      detail: p95 === null ? "no request measured" : `p95 ${ms(p95)} over ${f?.requests} requests`,
    });
  }
  return targets;
}

/** The compact table and the lines under it. */
export function render(
  s: RunSettings,
  figs: EndpointFigures[],
  uploads: UploadOutcome[],
  p: CheckProgress,
  targets: Target[],
  extra: {
    checksWindowMs: number | null;
    uploadBurstMs: number | null;
    loadAvg: string;
    reportsOpened: number;
    phases: PhaseFigures[];
    loop: LoopFigures;
  },
): string {
  const rows = figs.map((f) => figureCells(LABEL[f.endpoint] ?? f.endpoint, f));
  const rowsTotal = s.providers * s.rows;
  const lines = [
    `Tributary load run: ${s.providers} providers × ${s.rows.toLocaleString("en")} rows uploaded at once, ${s.analysts} analysts at ${s.analystRate} request/s each, ${s.workers} worker${s.workers === 1 ? "" : "s"}`,
    "",
    table(["endpoint", "requests", "req/s", "p50", "p95", "p99", "max", "non-2xx", "socket errors"], rows),
    "",
    table(
      [
        "analysts' requests by phase",
        "window",
        "queue n",
        "queue p50",
        "queue p95",
        "report n",
        "report p50",
        "report p95",
      ],
      extra.phases.map((ph) => [
        ph.name,
        `${ph.seconds.toFixed(1)} s`,
        String(ph.queue.requests),
        ms(ph.queue.p50),
        ms(ph.queue.p95),
        String(ph.report.requests),
        ms(ph.report.p50),
        ms(ph.report.p95),
      ]),
    ),
    "",
    `uploads accepted         ${uploads.filter((u) => u.status === 201).length}/${s.providers} (first sent → last accepted ${secs(extra.uploadBurstMs)})`,
    `batches reported         ${p.reported}/${s.providers} (${p.ready} ready for review, ${p.unreadable} unreadable; ${p.reports} reports stored, ${p.failedAttempts} failed check attempts)`,
    `reports opened           ${extra.reportsOpened} distinct batch versions with a stored report`,
    `last upload → last report ${secs(lastUploadToLastReport(p))}`,
    `checks                   ${rowsTotal.toLocaleString("en")} rows in ${secs(extra.checksWindowMs)} from first upload to last report` +
      (extra.checksWindowMs
        ? ` (${Math.round(rowsTotal / (extra.checksWindowMs / 1000)).toLocaleString("en")} rows/s)`
        : ""),
    `event loop held up       app: longest ${ms(extra.loop.appMaxMs)} (${extra.loop.appSecondsOver100Ms} s with a stall of 100 ms or more); load generator: longest ${ms(extra.loop.generatorMaxMs)}`,
    `machine                  ${extra.loadAvg}`,
    "",
    ...targets.map((t) => `${t.met ? "met   " : "MISSED"} ${t.name}: ${t.detail}`),
  ];
  return lines.join("\n");
}
