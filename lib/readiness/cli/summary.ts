/** The readable summary of a report, as the command prints it without --json. */
import { countOf, formatNumber, pEquals } from "../format-number";
import type { ReadinessReport } from "../report";

export function summary(r: ReadinessReport, file: string): string {
  const lines: string[] = [];
  const c = r.counts;
  lines.push(`Readiness report for ${file}`);
  if (r.status === "unreadable") {
    lines.push("  status: UNREADABLE");
  } else {
    lines.push(
      `  rows: ${formatNumber(r.rows.total, "count")} (complete for the model: ${formatNumber(r.rows.complete, "count")})`,
    );
    lines.push(
      `  model: ${countOf(r.model.parameters, "parameter")}, residual df ${formatNumber(r.model.residualDf, "count")} (target ${formatNumber(r.model.dfTarget, "count")})${r.model.perParameter !== null ? `, ${formatNumber(r.model.perParameter, "estimate")} rows per parameter` : ""}`,
    );
    if (r.fit) {
      lines.push(
        `  fit preview: R² ${formatNumber(r.fit.rSquared, "estimate")}, adjusted ${formatNumber(r.fit.adjRSquared, "estimate")}, F ${formatNumber(r.fit.F, "statistic")} on (${r.fit.dfModel}, ${r.fit.dfResidual}) df, p ${pEquals(r.fit.pValue)}`,
      );
    }
  }
  lines.push(
    `  findings: ${countOf(c.blocker, "blocker")}, ${countOf(c.warning, "warning")}, ${countOf(c.note, "note")}`,
  );
  for (const f of r.findings) {
    lines.push("");
    lines.push(
      `[${f.severity.toUpperCase()}] ${f.code}${f.columns.length ? ` (${f.columns.join(", ")})` : ""}`,
    );
    lines.push(`  ${f.message}`);
    if (f.rows.length)
      lines.push(
        `  rows: ${f.rows.join(", ")}${f.rowCount && f.rowCount > f.rows.length ? ` … (${formatNumber(f.rowCount, "count")} in all)` : ""}`,
      );
    lines.push(`  fix: ${f.fix}`);
  }
  if (r.timings) lines.push("", `checked in ${formatNumber(r.timings.ms / 1000, "estimate")} s`);
  return lines.join("\n");
}
