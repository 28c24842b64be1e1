/**
 * The one place a readiness report is put together — a checked batch, an unreadable file, a
 * pool (empty or not) — so that every figure (e.g. `parameters`) means the same in each.
 */
import { buildDesign, predictorsOf } from "./design";
import { countFindings } from "./findings";
import { thresholdsOf, type Plan } from "./plan";
import { REPORT_FORMAT, type ReadinessReport } from "./report";

/** Version of the engine's checks; part of every report and state. */
export const ENGINE_VERSION = "1.1.0";

type Analysis = Pick<
  ReadinessReport,
  "rows" | "model" | "columns" | "missingness" | "collinearity" | "fit" | "sampleSize"
>;

/** The model figures when no row was analysed: the plan's parameters, no residual df. */
function emptyAnalysis(plan: Plan): Analysis {
  const t = thresholdsOf(plan);
  const d = buildDesign(plan, predictorsOf(plan));
  return {
    rows: { total: 0, complete: 0 },
    model: {
      parameters: d.columns.length - (plan.intercept ? 1 : 0),
      residualDf: 0,
      perParameter: null,
      terms: d.terms,
      dfTarget: t.dfTarget ?? t.dfFloor,
    },
    columns: [],
    missingness: { patterns: [] },
    collinearity: null,
    fit: null,
  };
}

export function buildReport(r: {
  status: ReadinessReport["status"];
  planHash: string;
  findings: ReadinessReport["findings"];
  ms: number;
  /** the analysis of the rows; without it, `plan` gives the figures of an empty one */
  analysis?: Analysis;
  plan?: Plan;
  state?: unknown;
  file?: ReadinessReport["file"];
}): ReadinessReport {
  const a = r.analysis ?? emptyAnalysis(r.plan!);
  return {
    format: REPORT_FORMAT,
    status: r.status,
    engineVersion: ENGINE_VERSION,
    planHash: r.planHash,
    ...(r.file ? { file: r.file } : {}),
    rows: a.rows,
    model: a.model,
    columns: a.columns,
    missingness: a.missingness,
    collinearity: a.collinearity,
    fit: a.fit,
    ...(a.sampleSize !== undefined ? { sampleSize: a.sampleSize } : {}),
    findings: r.findings,
    counts: countFindings(r.findings),
    ...(r.state !== undefined ? { state: r.state } : {}),
    timings: { ms: r.ms },
  };
}
