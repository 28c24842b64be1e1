/**
 * The clients of the scale run, through HAProxy: every request is timed on its own and
 * recorded per endpoint and per instance (HAProxy's X-Tributary-Instance header). A request
 * that met no instance or a database that was restarting (socket error, 502, 503) is tried
 * again after a pause (at most 40 times, about 40 s), as a client of a real deployment would;
 * each retry is counted. Only a request that never succeeded is an error. Uploads carry an
 * Idempotency-Key, so a retried upload never records a second version.
 */
import type { UploadBody } from "./batches";
import { Recorder, type Endpoint } from "./stats";

export class ScaleRecorder {
  readonly all = new Recorder();
  readonly byInstance = new Map<string, Recorder>();
  retries: Partial<Record<Endpoint, number>> = {};
  /** requests that failed every try */
  failures: string[] = [];

  record(endpoint: Endpoint, instance: string, status: number, latencyMs: number, body: string) {
    this.all.response(endpoint, status, latencyMs, body.length, body);
    let r = this.byInstance.get(instance);
    if (!r) this.byInstance.set(instance, (r = new Recorder()));
    r.response(endpoint, status, latencyMs, body.length, body);
  }
}

const RETRYABLE = new Set([502, 503, 504]);
/** this run's name in the uploads' Idempotency-Keys */
const RUN = `${process.pid}-${Date.now().toString(36)}`;
const pause = (ms: number) => new Promise((r) => setTimeout(r, ms));

/** One request with retries; resolves with the last answer (status 0: never answered). */
export async function call(
  rec: ScaleRecorder,
  endpoint: Endpoint,
  url: string,
  init: RequestInit,
  timeoutMs = 60_000,
): Promise<{ status: number; body: string; instance: string }> {
  let last = { status: 0, body: "", instance: "none" };
  for (let attempt = 0; attempt < 40; attempt++) {
    if (attempt > 0) {
      rec.retries[endpoint] = (rec.retries[endpoint] ?? 0) + 1;
      await pause(1000);
    }
    const t0 = performance.now();
    try {
      const res = await fetch(url, { ...init, signal: AbortSignal.timeout(timeoutMs) });
      const body = await res.text();
      const instance = res.headers.get("x-tributary-instance") ?? "none";
      last = { status: res.status, body, instance };
      rec.record(endpoint, instance, res.status, performance.now() - t0, body);
      if (!RETRYABLE.has(res.status)) return last;
    } catch (e) {
      last = { status: 0, body: e instanceof Error ? e.message : String(e), instance: "none" };
      rec.all.socketError(endpoint, e instanceof Error ? e : new Error(String(e)));
    }
  }
  rec.failures.push(`${endpoint} ${url}: ${last.status} ${last.body.slice(0, 200)}`);
  return last;
}

type QueueItem = { batchId: string; version: number; state: string };

/** Analysts (queue, a report, the pool, in turn) and leads (the board), each at `rate` requests a second. */
export function startReaders(
  origin: string,
  studySlug: string,
  analysts: string[],
  leads: string[],
  rec: ScaleRecorder,
  rate: number,
): { stop(): Promise<void>; reportsOpened(): number } {
  let stopped = false;
  const opened = new Set<string>();
  const every = 1000 / rate;
  // Each reader starts at its own slot within one period, so the readers' requests are spread evenly
  // over it; the leads take the slots after the analysts' (they once reused slots 0..4, which sent all
  // five board reads within a few ms of each other every period).
  const loop = async (token: string, i: number, lead: boolean) => {
    const headers = { authorization: `Bearer ${token}`, accept: "application/json" };
    let seen: QueueItem[] = [];
    await pause((i * every) / (analysts.length + leads.length));
    for (let n = i; !stopped; n++) {
      const started = Date.now();
      if (lead) await call(rec, "board", `${origin}/api/v1/board`, { headers });
      else if (n % 3 === 0 || seen.length === 0) {
        const r = await call(rec, "queue", `${origin}/api/v1/queue`, { headers });
        if (r.status === 200) {
          const items = (JSON.parse(r.body) as { data?: QueueItem[] }).data ?? [];
          seen = items.filter((q) => q.state !== "received" && q.state !== "checking");
        }
      } else if (n % 3 === 1) {
        const q = seen[n % seen.length]!;
        const r = await call(
          rec,
          "report",
          `${origin}/api/v1/batches/${q.batchId}/versions/${q.version}/report`,
          {
            headers,
          },
        );
        if (r.status === 200 && r.body.includes('"report":{')) opened.add(`${q.batchId}/${q.version}`);
      } else await call(rec, "pool", `${origin}/api/v1/pool/${studySlug}`, { headers });
      await pause(Math.max(0, every - (Date.now() - started)));
    }
  };
  const runs = [
    ...analysts.map((t, i) => loop(t, i, false)),
    ...leads.map((t, i) => loop(t, analysts.length + i, true)),
  ];
  return {
    async stop() {
      stopped = true;
      await Promise.all(runs);
    },
    reportsOpened: () => opened.size,
  };
}

export interface UploadOutcome {
  k: number;
  status: number;
  batchId: string | null;
  instance: string;
  acceptedAt: number | null;
}

/** Provider k's batch (built beforehand: loadBatch of scripts/load/batches.ts). */
export async function upload(
  origin: string,
  rec: ScaleRecorder,
  k: number,
  b: UploadBody,
): Promise<UploadOutcome> {
  const r = await call(
    rec,
    "upload",
    `${origin}/api/v1/batches`,
    // one key per provider's upload: a retry after a cut connection or a killed instance answers
    // the version the first attempt recorded instead of making a second one
    {
      method: "POST",
      headers: { ...b.headers, "idempotency-key": `"scale-${RUN}-${k}"` },
      body: new Uint8Array(b.body),
    },
    180_000,
  );
  const batchId =
    r.status === 201 ? ((JSON.parse(r.body) as { data?: { batchId?: string } }).data?.batchId ?? null) : null;
  return {
    k,
    status: r.status,
    batchId,
    instance: r.instance,
    acceptedAt: r.status === 201 ? Date.now() : null,
  };
}

/**
 * Sign-in limits across instances: `failures` wrong passwords for one account through HAProxy
 * (next-auth's credentials callback, with its CSRF token), then the right one, which must be
 * refused. Says which instances answered the failures.
 */
export async function signInLimit(
  origin: string,
  rec: ScaleRecorder,
  email: string,
  password: string,
  failures: number,
): Promise<{ instances: Record<string, number>; refusedAfter: boolean; detail: string }> {
  const instances: Record<string, number> = {};
  const attempt = async (pw: string, n: number) => {
    // two requests per attempt (the CSRF token, the sign-in): under roundrobin every sign-in would
    // meet the same instance, so every other attempt asks for the token twice
    if (n % 2 === 1) await (await fetch(`${origin}/api/auth/csrf`)).arrayBuffer();
    const csrf = await fetch(`${origin}/api/auth/csrf`);
    const cookie = (csrf.headers.getSetCookie() ?? []).map((c) => c.split(";")[0]).join("; ");
    const { csrfToken } = (await csrf.json()) as { csrfToken: string };
    const body = new URLSearchParams({ email, password: pw, csrfToken, callbackUrl: origin, json: "true" });
    const r = await call(rec, "sign-in", `${origin}/api/auth/callback/credentials`, {
      method: "POST",
      redirect: "manual",
      headers: { "content-type": "application/x-www-form-urlencoded", cookie },
      body,
    });
    instances[r.instance] = (instances[r.instance] ?? 0) + 1;
    return `${r.status} ${r.body}`;
  };
  for (let i = 0; i < failures; i++) await attempt(`wrong-password-${i}`, i);
  const last = await attempt(password, failures);
  return { instances, refusedAfter: /TooManyAttempts/.test(last), detail: last.slice(0, 200) };
}
