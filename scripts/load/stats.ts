/**
 * Per-endpoint figures of a load run. Every response's latency (autocannon's per-request
 * responseTime: from writing the request to the last byte of the answer, in ms) is kept, and
 * percentiles are read from the sorted list by the nearest-rank rule (p-th percentile = the
 * value at rank ceil(p/100 · n)), so p95 is exact rather than read off autocannon's summary,
 * which reports p50, p97.5 and p99 only.
 */
export type Endpoint = "upload" | "queue" | "report" | "pool" | "board" | "sign-in";

export interface EndpointFigures {
  endpoint: Endpoint;
  requests: number;
  ok2xx: number;
  non2xx: number;
  socketErrors: number;
  /** requests answered per second over the window the endpoint was driven */
  throughput: number;
  bytes: number;
  p50: number | null;
  p95: number | null;
  p99: number | null;
  max: number | null;
  statusCodes: Record<string, number>;
  /** the first few error answers or socket errors, to say what went wrong */
  errorSamples: string[];
}

/** The value at nearest rank ceil(p/100 · n) of an ascending list (null when empty). */
export function percentile(sorted: readonly number[], p: number): number | null {
  if (sorted.length === 0) return null;
  const rank = Math.max(1, Math.ceil((p / 100) * sorted.length));
  return sorted[Math.min(rank, sorted.length) - 1] ?? null;
}

class Series {
  latencies: number[] = [];
  /** Date.now() when each answer arrived, in the order of `latencies` */
  at: number[] = [];
  statuses: number[] = [];
  statusCodes: Record<string, number> = {};
  socketErrors = 0;
  bytes = 0;
  first = Infinity;
  last = -Infinity;
  errorSamples: string[] = [];
}

/** Collects latencies, status codes and socket errors per endpoint. */
export class Recorder {
  private series = new Map<Endpoint, Series>();
  /** answers to requests sent before this time (Date.now() clock) are not counted */
  private from = -Infinity;

  /** Counts only requests sent from now on (the analysts' lead-in before the uploads is not measured). */
  measureFrom(at: number): void {
    this.from = at;
    // everything answered so far was sent before `at`
    this.series.clear();
  }

  private of(endpoint: Endpoint): Series {
    let s = this.series.get(endpoint);
    if (!s) this.series.set(endpoint, (s = new Series()));
    return s;
  }

  /** One answer: its status, latency (ms), size in bytes, and body (kept for the first few errors). */
  response(
    endpoint: Endpoint,
    status: number,
    latencyMs: number,
    bytes: number,
    body?: string,
    answeredAt = Date.now(),
  ): void {
    const now = answeredAt;
    if (now - latencyMs < this.from) return;
    const s = this.of(endpoint);
    s.latencies.push(latencyMs);
    s.at.push(now);
    s.statuses.push(status);
    s.statusCodes[status] = (s.statusCodes[status] ?? 0) + 1;
    s.bytes += bytes;
    s.first = Math.min(s.first, now - latencyMs);
    s.last = Math.max(s.last, now);
    if ((status < 200 || status > 299) && s.errorSamples.length < 5)
      s.errorSamples.push(`${status} ${(body ?? "").slice(0, 300)}`);
  }

  socketError(endpoint: Endpoint, error: Error): void {
    const s = this.of(endpoint);
    s.socketErrors++;
    if (s.errorSamples.length < 5) s.errorSamples.push(`socket: ${error.message}`);
  }

  /** Latency percentiles of the answers that arrived in [from, to) (Date.now() clock). */
  window(
    endpoint: Endpoint,
    from: number,
    to: number,
  ): { requests: number; p50: number | null; p95: number | null; p99: number | null } {
    const s = this.of(endpoint);
    const sorted = s.latencies
      .filter((_, i) => (s.at[i] ?? 0) >= from && (s.at[i] ?? 0) < to)
      .sort((a, b) => a - b);
    return {
      requests: sorted.length,
      p50: percentile(sorted, 50),
      p95: percentile(sorted, 95),
      p99: percentile(sorted, 99),
    };
  }

  /** Every answer as [ms since `origin` when it arrived, latency ms, status], for a timeline. */
  samples(endpoint: Endpoint, origin: number): [number, number, number][] {
    const s = this.of(endpoint);
    return s.latencies.map((l, i) => [(s.at[i] ?? 0) - origin, Math.round(l * 10) / 10, s.statuses[i] ?? 0]);
  }

  figures(endpoint: Endpoint): EndpointFigures {
    const s = this.of(endpoint);
    const sorted = [...s.latencies].sort((a, b) => a - b);
    const ok2xx = Object.entries(s.statusCodes).reduce(
      (n, [code, c]) => (code.startsWith("2") ? n + c : n),
      0,
    );
    const window = (s.last - s.first) / 1000;
    const round = (x: number | null) => (x === null ? null : Math.round(x * 10) / 10);
    return {
      endpoint,
      requests: sorted.length,
      ok2xx,
      non2xx: sorted.length - ok2xx,
      socketErrors: s.socketErrors,
      throughput: window > 0 ? Math.round((sorted.length / window) * 10) / 10 : 0,
      bytes: s.bytes,
      p50: round(percentile(sorted, 50)),
      p95: round(percentile(sorted, 95)),
      p99: round(percentile(sorted, 99)),
      max: round(sorted.at(-1) ?? null),
      statusCodes: s.statusCodes,
      errorSamples: s.errorSamples,
    };
  }
}

function pad(cells: string[], widths: number[]): string {
  return cells.map((c, i) => (i === 0 ? c.padEnd(widths[i] ?? 0) : c.padStart(widths[i] ?? 0))).join("  ");
}

/** A plain-text table (first column left-aligned, the rest right-aligned). */
export function table(header: string[], rows: string[][]): string {
  const widths = header.map((h, i) => Math.max(h.length, ...rows.map((r) => (r[i] ?? "").length)));
  return [
    pad(header, widths),
    widths.map((w) => "-".repeat(w)).join("  "),
    ...rows.map((r) => pad(r, widths)),
  ].join("\n");
}

export const ms = (x: number | null) => (x === null ? "–" : `${x.toFixed(0)} ms`);

/** One endpoint's row of the printed tables (plain and scale runs): requests, rate, latencies, errors. */
export function figureCells(label: string, f: EndpointFigures): string[] {
  return [
    label,
    String(f.requests),
    f.throughput.toFixed(1),
    ms(f.p50),
    ms(f.p95),
    ms(f.p99),
    ms(f.max),
    String(f.non2xx),
    String(f.socketErrors),
  ];
}
