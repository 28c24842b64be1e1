/**
 * checkBatch: one streaming pass over a batch file, then the report.
 */
import { analyse, type Summary } from "./analyse";
import { readCsv, type ByteInput, type CsvLimits } from "./csv-reader";
import { UnreadableError } from "./decode";
import { finding, sortFindings } from "./findings";
import type { Evidence } from "./findings-data";
import { rowFindings } from "./findings-rows";
import { thresholdsOf, type Plan } from "./plan";
import type { ReadinessReport } from "./report";
import { ENGINE_VERSION, buildReport } from "./report-build";
import { Scan } from "./scan";
import { stateOf } from "./state";

export { ENGINE_VERSION };

export interface CheckOptions {
  onProgress?: (p: { rows: number; bytes: number }) => void;
  fileName?: string;
  /** tighter or looser reading limits (tests) */
  limits?: Partial<CsvLimits>;
  /** the input's size in bytes when known (sizes the duplicate tables up front) */
  expectedBytes?: number;
  /** a fast strict UTF-8 validator (lib/readiness/node.ts passes Node's buffer.isUtf8) */
  isUtf8?: (b: Uint8Array) => boolean;
  /** "strings": records handed to the scan as strings instead of byte spans (tests compare both) */
  path?: "bytes" | "strings";
}

function canonical(v: unknown): string {
  if (Array.isArray(v)) return `[${v.map(canonical).join(",")}]`;
  if (v && typeof v === "object") {
    return `{${Object.keys(v)
      .filter((k) => (v as Record<string, unknown>)[k] !== undefined)
      .sort()
      .map((k) => `${JSON.stringify(k)}:${canonical((v as Record<string, unknown>)[k])}`)
      .join(",")}}`;
  }
  return JSON.stringify(v);
}

/** sha-256 (hex) of the plan's canonical JSON (keys sorted), through Web Crypto. */
export async function hashPlan(plan: Plan): Promise<string> {
  const bytes = new TextEncoder().encode(canonical(plan));
  const digest = await globalThis.crypto.subtle.digest("SHA-256", bytes);
  return [...new Uint8Array(digest)].map((b) => b.toString(16).padStart(2, "0")).join("");
}

export const now = () => (typeof performance !== "undefined" ? performance.now() : Date.now());

/** The report of a file that cannot be read: status "unreadable" and one blocker saying why. */
export function unreadableReport(
  plan: Plan,
  planHash: string,
  e: UnreadableError,
  bytes: number | null,
  ms: number,
): ReadinessReport {
  const findings = [finding("file.unreadable", "blocker", [], e.message, e.fix, { detail: e.detail })];
  return buildReport({
    status: "unreadable",
    plan,
    planHash,
    findings,
    ms,
    file: bytes !== null ? { bytes, encoding: "unknown", delimiter: "", decimal: "." } : undefined,
  });
}

/**
 * Check one batch file against a data plan: one pass over the bytes in bounded memory, then
 * every finding of lib/readiness/CHECKS.md. Never throws for a bad file: it returns an "unreadable" report.
 */
export async function checkBatch(
  input: ByteInput,
  plan: Plan,
  opts: CheckOptions = {},
): Promise<ReadinessReport> {
  const t0 = now();
  const planHash = await hashPlan(plan);
  const scan = new Scan(plan);
  scan.expectedBytes = opts.expectedBytes ?? 0;
  let read: Awaited<ReturnType<typeof readCsv>>;
  try {
    const sink =
      opts.path === "strings"
        ? { onHeader: scan.onHeader.bind(scan), onRecords: scan.onRecords.bind(scan) }
        : scan;
    read = await readCsv(input, sink, {
      onProgress: opts.onProgress,
      limits: opts.limits,
      isUtf8: opts.isUtf8,
    });
  } catch (e) {
    if (e instanceof UnreadableError) return unreadableReport(plan, planHash, e, null, now() - t0);
    throw e;
  }
  return reportFromScan(
    scan,
    plan,
    planHash,
    {
      bytes: read.bytes,
      records: read.records,
      bom: read.meta?.bom ?? false,
      delimiter: read.meta?.delimiter ?? ",",
    },
    t0,
  );
}

/** The report of a finished pass (one stream, or the merged byte ranges of a file). */
export function reportFromScan(
  scan: Scan,
  plan: Plan,
  planHash: string,
  read: { bytes: number; records: number; bom: boolean; delimiter: string },
  t0: number,
): ReadinessReport {
  const t = thresholdsOf(plan);
  const state = stateOf(scan, ENGINE_VERSION, planHash);
  const evidence: Evidence = {
    missingRows: new Map(),
    responseMissingRows: scan.responseMissing.rows,
    levelRows: new Map(),
  };
  const summaries = new Map<string, { summary: Summary; exact: boolean }>();
  for (const c of scan.cols) {
    if (!evidence.missingRows.has(c.name)) evidence.missingRows.set(c.name, c.missing.rows);
    if (c.levels && c.plan?.type === "category")
      evidence.levelRows.set(c.name, new Map([...c.levels].map(([l, a]) => [l, a.rows])));
    if (c.quant && c.moments.n > 0 && !summaries.has(c.name)) {
      const [q1, median, q3] = c.quant.quantiles([0.25, 0.5, 0.75]) as [number, number, number];
      const m = c.moments;
      summaries.set(c.name, {
        summary: { min: m.min, q1, median, q3, max: m.max, mean: m.mean, sd: m.sd },
        exact: c.quant.exact,
      });
    }
  }
  const a = analyse(state, plan, t, { evidence, summaries });
  const findings = sortFindings([...rowFindings(scan), ...a.findings]);
  if (read.records === 0) {
    findings.push(
      finding(
        "file.header-only",
        "note",
        [],
        "The file has a header row but no data rows.",
        "Export the data rows too; check that the sheet was not filtered to nothing before saving.",
        { rows: [1] },
      ),
    );
  }
  const decimal = scan.cols.some((c) => c.comma.count > 0 && c.comma.count * 2 > c.moments.n) ? "," : ".";
  return checkedReport(a, findings, planHash, state, now() - t0, {
    bytes: read.bytes,
    encoding: read.bom ? "utf-8 (BOM)" : "utf-8",
    delimiter: read.delimiter,
    decimal,
  });
}

/** A "checked" report from an analysis and its findings (batches and pools). */
export function checkedReport(
  a: Pick<
    ReadinessReport,
    "rows" | "model" | "columns" | "missingness" | "collinearity" | "fit" | "sampleSize"
  >,
  findings: ReadinessReport["findings"],
  planHash: string,
  state: unknown,
  ms: number,
  file?: ReadinessReport["file"],
): ReadinessReport {
  return buildReport({ status: "checked", planHash, analysis: a, findings, state, ms, file });
}
