/**
 * The traffic of a load run, driven by autocannon: the providers' uploads (one instance per
 * provider, one POST each, all started at once) and the analysts (one instance per analyst,
 * one connection with the analyst's own token, `rate` requests a second alternating between
 * the review queue and a report of a batch that analyst saw in it). The analysts start
 * staggered over one request interval so their polls do not arrive in lock-step.
 */
import autocannon from "autocannon";
import type { UploadBody } from "./batches";
import type { Endpoint, Recorder } from "./stats";

// autocannon samples its own summary every sampleInt ms; 1 ms (its default) costs CPU for nothing here
const SAMPLE_MS = 250;

function run(opts: autocannon.Options): {
  instance: autocannon.Instance;
  done: Promise<autocannon.Result | null>;
} {
  let instance!: autocannon.Instance;
  const done = new Promise<autocannon.Result | null>((resolve) => {
    instance = autocannon(opts, (err, result) => resolve(err ? null : result));
  });
  return { instance, done };
}

export interface UploadOutcome {
  fileName: string;
  status: number | null;
  /** Date.now() when the 201 arrived */
  acceptedAt: number | null;
  batchId: string | null;
  version: number | null;
  error: string | null;
}

/** All uploads at once; resolves when each has its answer (or failed on the socket). */
export async function runUploads(
  origin: string,
  bodies: UploadBody[],
  rec: Recorder,
  timeoutS: number,
): Promise<UploadOutcome[]> {
  const runs = bodies.map((b) => {
    const out: UploadOutcome = {
      fileName: b.fileName,
      status: null,
      acceptedAt: null,
      batchId: null,
      version: null,
      error: null,
    };
    let lastBody = "";
    const { instance, done } = run({
      url: origin,
      connections: 1,
      amount: 1,
      timeout: timeoutS,
      sampleInt: SAMPLE_MS,
      requests: [
        {
          method: "POST",
          path: "/api/v1/batches",
          headers: b.headers,
          body: b.body,
          onResponse: (status, body) => {
            lastBody = body;
            out.status = status;
            if (status === 201) {
              out.acceptedAt = Date.now();
              const data = (JSON.parse(body) as { data?: { batchId?: string; version?: number } }).data;
              out.batchId = data?.batchId ?? null;
              out.version = data?.version ?? null;
            } else {
              out.error = body.slice(0, 300);
            }
          },
        },
      ],
    });
    instance.on("response", (_client, status, bytes, latency) =>
      rec.response("upload", status, latency, bytes, lastBody),
    );
    instance.on("reqError", (e: Error) => {
      out.error = `socket: ${e.message}`;
      rec.socketError("upload", e);
    });
    return done.then(() => out);
  });
  return Promise.all(runs);
}

export interface AnalystTraffic {
  /** stops every analyst and waits until they have stopped */
  stop(): Promise<void>;
  /** how many distinct batch versions the analysts opened a stored report of */
  reportsOpened(): number;
}

type QueueItem = { batchId: string; version: number; state: string };

/** Starts the analysts; they run until stop() or `maxSeconds`, whichever comes first. */
export function startAnalysts(
  origin: string,
  tokens: string[],
  rec: Recorder,
  opts: { rate: number; maxSeconds: number },
): AnalystTraffic {
  const runs: Promise<unknown>[] = [];
  const instances: autocannon.Instance[] = [];
  const timers: NodeJS.Timeout[] = [];
  const opened = new Set<string>();
  let stopped = false;
  const spacing = 1000 / opts.rate / Math.max(1, tokens.length);

  tokens.forEach((token, i) => {
    const headers = { authorization: `Bearer ${token}`, accept: "application/json" };
    let inflight: Endpoint = "queue";
    let lastBody = "";
    let seen: QueueItem[] = [];
    // each analyst starts at another place in the list, so between them they open many reports
    let next = i;
    let opening = "";
    const start = () => {
      if (stopped) return;
      const { instance, done } = run({
        url: origin,
        connections: 1,
        connectionRate: opts.rate,
        duration: opts.maxSeconds,
        timeout: 30,
        sampleInt: SAMPLE_MS,
        requests: [
          {
            method: "GET",
            path: "/api/v1/queue",
            headers,
            setupRequest: (req) => {
              inflight = "queue";
              return req;
            },
            onResponse: (status, body) => {
              lastBody = body;
              if (status !== 200) return;
              const items = (JSON.parse(body) as { data?: QueueItem[] }).data ?? [];
              // reports first: a batch still being checked answers with its progress only
              const stored = items.filter((q) => q.state === "ready" || q.state === "unreadable");
              seen = stored.length > 0 ? stored : items;
            },
          },
          {
            method: "GET",
            headers,
            setupRequest: (req) => {
              const item = seen.length > 0 ? seen[next++ % seen.length] : undefined;
              // nothing visible yet: autocannon goes back to the queue request
              if (!item) return null as unknown as autocannon.Request;
              inflight = "report";
              opening = `${item.batchId}/${item.version}`;
              return {
                ...req,
                path: `/api/v1/batches/${encodeURIComponent(item.batchId)}/versions/${item.version}/report`,
              };
            },
            onResponse: (status, body) => {
              lastBody = body;
              if (status === 200 && body.includes('"report":{')) opened.add(opening);
            },
          },
        ],
      });
      instance.on("response", (_client, status, bytes, latency) =>
        rec.response(inflight, status, latency, bytes, lastBody),
      );
      instance.on("reqError", (e: Error) => rec.socketError(inflight, e));
      instances.push(instance);
      runs.push(done);
    };
    timers.push(setTimeout(start, Math.round(i * spacing)));
  });

  return {
    async stop() {
      stopped = true;
      timers.forEach(clearTimeout);
      instances.forEach((inst) => inst.stop());
      await Promise.all(runs);
    },
    reportsOpened: () => opened.size,
  };
}
