/**
 * A least-squares fit as the batch page and the pool page show it: R², adjusted R², the residual
 * standard error, the overall F test with its p, the R² the fit can detect (when the report has
 * a power figure), and the coefficients.
 */
import { detectableR2 as detectable, formatNumber, pEquals } from "@/lib/format";
import type { ReadinessReport } from "@/lib/readiness";
import { CoefficientsTable } from "./report-tables";

type Fit = NonNullable<ReadinessReport["fit"]>;

export function FitSummary({ fit, csvName }: { fit: Fit; csvName: string }) {
  return (
    <div className="grid grid-cols-1 gap-3">
      <p className="text-sm tabular-nums">
        R² = {formatNumber(fit.rSquared, "estimate")} · adjusted R² ={" "}
        {formatNumber(fit.adjRSquared, "estimate")} · residual standard error{" "}
        {formatNumber(fit.residualStdError, "estimate")} on {fit.dfResidual} df · overall F ={" "}
        {formatNumber(fit.F, "statistic")} on ({fit.dfModel}, {fit.dfResidual}) df, p {pEquals(fit.pValue)}
        {fit.power?.detectableR2 != null
          ? ` · detects ${detectable(fit.power.detectableR2)} with power ${formatNumber(fit.power.power, "estimate")} at α = ${formatNumber(fit.power.alpha, "estimate")}`
          : ""}
      </p>
      <CoefficientsTable coefficients={fit.coefficients} csvName={csvName} />
    </div>
  );
}
