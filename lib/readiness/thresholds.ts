/**
 * The plan's thresholds: the defaults (each described in lib/readiness/CHECKS.md) and the
 * schema of a plan's overrides.
 */
import { z } from "zod";

/** Default thresholds of lib/readiness/CHECKS.md; a plan may override each. */
export const DEFAULT_THRESHOLDS = {
  /** share missing per column: note above this */
  missingNote: 0,
  /** [cp] warning at or above 10 % */
  missingWarning: 0.1,
  /** [cp] blocker at or above 40 % */
  missingBlocker: 0.4,
  /** [cp: 5–10] a level with fewer complete cases is sparse */
  sparseLevel: 10,
  /** more levels than this: probably not a factor */
  tooManyLevels: 50,
  /** levels on more than this share of rows: an identifier */
  identifierShare: 0.5,
  /** |r| between two numeric predictors */
  pairCorrelation: 0.9,
  /** [cp; Marquardt 1970] */
  vifWarning: 5,
  vifStrong: 10,
  /** Belsley, Kuh & Welsch 1980 */
  conditionIndex: 30,
  varianceProportion: 0.5,
  /** residual df below this is a blocker */
  dfFloor: 10,
  /** [cp: 10, 15 or 20 per parameter] */
  perParameter: 10,
  /** target residual df for the study's pool (the df headroom gauge); null = dfFloor */
  dfTarget: null as number | null,
  /** [cp] |standardized mean difference| against the pool */
  smd: 0.25,
  /** missingness that moved by more than this against the pool */
  missingDrift: 0.1,
  /** Little's MCAR test level */
  mcarAlpha: 0.05,
  /** overall F test: level and power for the detectable R² */
  alpha: 0.05,
  power: 0.8,
  /** how many sample rows a finding carries */
  sampleRows: 20,
};
export type Thresholds = typeof DEFAULT_THRESHOLDS;

/** A plan's overrides of the defaults, each optional. */
export const thresholdsSchema = z
  .object({
    missingNote: z.number().min(0).max(1),
    missingWarning: z.number().min(0).max(1),
    missingBlocker: z.number().min(0).max(1),
    sparseLevel: z.number().int().min(0),
    tooManyLevels: z.number().int().min(2),
    identifierShare: z.number().min(0).max(1),
    pairCorrelation: z.number().min(0).max(1),
    vifWarning: z.number().min(1),
    vifStrong: z.number().min(1),
    conditionIndex: z.number().min(1),
    varianceProportion: z.number().min(0).max(1),
    dfFloor: z.number().int().min(0),
    perParameter: z.number().min(0),
    dfTarget: z.number().int().min(0).nullable(),
    smd: z.number().min(0),
    missingDrift: z.number().min(0).max(1),
    mcarAlpha: z.number().gt(0).lt(1),
    alpha: z.number().gt(0).lt(1),
    power: z.number().gt(0).lt(1),
    sampleRows: z.number().int().min(1).max(1000),
  })
  .partial();
