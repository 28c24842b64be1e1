/** Numerical core of the readiness engine: streaming least squares, design analysis, distributions, sample-size rules, Little's MCAR test. */
export { LeastSquares, type LeastSquaresJSON } from "./least-squares";
export { analyseDesign, type DesignSpec, type DesignAnalysis } from "./design";
export { ALIAS_TOLERANCE } from "./aliasing";
export { highCorrelationPairs, conditionFlags } from "./collinearity";
export { PatternMoments, type PatternMomentsJSON } from "./missing";
export { littleMcar } from "./little-mcar";
export {
  fCdf,
  fUpper,
  tUpper,
  tTwoSided,
  chiSquareCdf,
  chiSquareUpper,
  qf,
  qt,
  qchisq,
  lnGamma,
  lnBeta,
  betaRegularized,
  gammaRegularized,
} from "./distributions";
export { noncentralFCdf, noncentralBetaCdf, overallFPower, detectableR2 } from "./power";
export { greenRules, rileyContinuous } from "./sample-size";
