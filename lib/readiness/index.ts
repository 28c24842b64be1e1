/**
 * The readiness engine: a batch file and a data plan in, the readiness report out.
 * Framework-free; runs in Node, worker threads, browser Web Workers and the CLI.
 */
export { checkBatch, ENGINE_VERSION, hashPlan, type CheckOptions } from "./check";
export { draftPlan, type DraftResult } from "./draft";
export { poolReport, driftFindings } from "./pool";
export { mergeStates, isEngineState, type EngineState } from "./state";
export * from "./pooling";
export { parsePlan, planSchema, thresholdsOf, DEFAULT_THRESHOLDS, type Plan, type PlanInput, type PlanIssue } from "./plan";
export { REPORT_FORMAT, type ReadinessReport, type Finding, type Severity, type ColumnReport } from "./report";
export { FINDING_CODES, isFindingCode, type FindingCode } from "./codes";
export type { ByteInput } from "./csv-reader";
export { rowsAtFault, ROW_FAULT_CODES, type Fault, type FaultLine, type RowsAtFaultOptions } from "./faults";
export { UnreadableError } from "./decode";
export * from "./fixes";
