/**
 * The readiness engine: a batch file and a data plan in, the readiness report out.
 * Framework-free; runs in Node, worker threads, browser Web Workers and the CLI.
 * This is the package's public entry (lib/readiness/package.json "exports"); Node-only helpers
 * are in "./node". The app imports nothing else (a lint rule in eslint.config.js keeps it so).
 */
export { checkBatch, ENGINE_VERSION, hashPlan, type CheckOptions } from "./check";
export { draftPlan, type DraftResult } from "./draft";
export { poolReport, driftFindings } from "./pool";
export { mergeStates, isEngineState, type EngineState } from "./state";
export * from "./pooling";
export {
  parsePlan,
  planSchema,
  thresholdsOf,
  DEFAULT_THRESHOLDS,
  ROLES,
  COLUMN_TYPES,
  type Plan,
  type PlanInput,
  type PlanIssue,
  type PlanColumn,
  type ColumnType,
  type Role,
  type Thresholds,
} from "./plan";
export {
  REPORT_FORMAT,
  type ReadinessReport,
  type Finding,
  type Severity,
  type ColumnReport,
  type Coefficient,
} from "./report";
export { buildDesign, predictorsOf, type Design, type DesignTerm, type Predictor } from "./design";
export { FINDING_CODES, isFindingCode, type FindingCode } from "./codes";
export type { ByteInput } from "./csv-reader";
export { csvRecords, type CsvRecord } from "./records";
export { rowsAtFault, ROW_FAULT_CODES, type Fault, type FaultLine, type RowsAtFaultOptions } from "./faults";
export { UnreadableError } from "./decode";
/** the seeded generator the demo data and tests draw from (Tommy Ettinger's Mulberry32) */
export { mulberry32 } from "./accumulators";
export {
  countOf,
  detectableR2,
  formatNumber,
  niceTicks,
  pEquals,
  plainNumber,
  type NumberPurpose,
} from "./format-number";
export * from "./fixes";
