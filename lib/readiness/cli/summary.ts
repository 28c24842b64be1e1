/** The readable summary of a report, as the command prints it without --json. */
import type { ReadinessReport } from "../report";

function fmtNum(x: number | null | undefined, digits = 4): string {
  if (x === null || x === undefined || !Number.isFinite(x)) return "–";
  return Math.abs(x) >= 1e5 || (Math.abs(x) < 1e-3 && x !== 0)
    ? x.toExponential(digits - 1)
    : x.toPrecision(digits);
}

export function summary(r: ReadinessReport, file: string): string {
  const lines: string[] = [];
  const c = r.counts;
  lines.push(`Readiness report for ${file}`);
  if (r.status === "unreadable") {
    lines.push("  status: UNREADABLE");
  } else {
    lines.push(
      `  rows: ${r.rows.total.toLocaleString("en")} (complete for the model: ${r.rows.complete.toLocaleString("en")})`,
    );
    lines.push(
      `  model: ${r.model.parameters} parameters, residual df ${r.model.residualDf} (target ${r.model.dfTarget})${r.model.perParameter !== null ? `, ${r.model.perParameter.toFixed(1)} rows per parameter` : ""}`,
    );
    if (r.fit) {
      lines.push(
        `  fit preview: R² ${fmtNum(r.fit.rSquared)}, adjusted ${fmtNum(r.fit.adjRSquared)}, F ${fmtNum(r.fit.F, 6)} on (${r.fit.dfModel}, ${r.fit.dfResidual}) df, p ${r.fit.pValue === 0 ? "< 1e-300" : fmtNum(r.fit.pValue, 3)}`,
      );
    }
  }
  lines.push(
    `  findings: ${c.blocker} blocker${c.blocker === 1 ? "" : "s"}, ${c.warning} warning${c.warning === 1 ? "" : "s"}, ${c.note} note${c.note === 1 ? "" : "s"}`,
  );
  for (const f of r.findings) {
    lines.push("");
    lines.push(
      `[${f.severity.toUpperCase()}] ${f.code}${f.columns.length ? ` (${f.columns.join(", ")})` : ""}`,
    );
    lines.push(`  ${f.message}`);
    if (f.rows.length)
      lines.push(
        `  rows: ${f.rows.join(", ")}${f.rowCount && f.rowCount > f.rows.length ? ` … (${f.rowCount.toLocaleString("en")} in all)` : ""}`,
      );
    lines.push(`  fix: ${f.fix}`);
  }
  if (r.timings) lines.push("", `checked in ${(r.timings.ms / 1000).toFixed(2)} s`);
  return lines.join("\n");
}
