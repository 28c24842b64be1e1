import type { DEFAULT_THRESHOLDS } from "@/lib/readiness/plan";

/** What each threshold does, in the product's words (values and sources in lib/readiness/CHECKS.md). */
export const THRESHOLD_LABELS: Record<keyof typeof DEFAULT_THRESHOLDS, string> = {
  missingNote: "Missing share: note above",
  missingWarning: "Missing share: warning at",
  missingBlocker: "Missing share: blocker at",
  sparseLevel: "Sparse level: fewer complete cases than",
  tooManyLevels: "Too many levels for a factor: more than",
  identifierShare: "Looks like an identifier: levels on more than this share",
  pairCorrelation: "Pair correlation |r| warning at",
  vifWarning: "VIF warning at",
  vifStrong: "VIF strong warning at",
  conditionIndex: "Condition index at",
  varianceProportion: "Variance proportion at",
  dfFloor: "Residual df floor (blocker below)",
  perParameter: "Complete cases per parameter",
  dfTarget: "Residual df target for the pool",
  smd: "Standardized mean difference against the pool",
  missingDrift: "Missingness drift against the pool",
  mcarAlpha: "Little's MCAR test level",
  alpha: "Overall F test level",
  power: "Power for the detectable R²",
  sampleRows: "Sample rows per finding",
};
