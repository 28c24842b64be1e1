/** A readiness report on screen: verdict, df ledger, findings, columns, collinearity, missingness, fit. */
import { Section } from "@/components/ui";
import { SeverityBadge } from "@/components/severity-badge";
import { countOf, formatCount, formatNumber, pEquals } from "@/lib/format";
import { DEFAULT_THRESHOLDS, parsePlan, thresholdsOf, type ReadinessReport } from "@/lib/readiness";
import { DfLedger, ledgerOf } from "./df-ledger";
import { ColumnsTable, FindingsTable, type FindingRow } from "./report-tables";
import { FitSummary } from "./fit-summary";
import { MissingnessMap } from "./report-pictures";
import { CollinearityPanel } from "./collinearity-panel";

export function verdictOf(report: ReadinessReport): { tone: "clay" | "ochre" | "reed"; text: string } {
  if (report.status === "unreadable")
    return { tone: "clay", text: "This file could not be read. The finding below says why and what to do." };
  if (report.counts.blocker > 0) {
    return {
      tone: "clay",
      text: `Needs fixes: ${countOf(report.counts.blocker, "blocker")} must be fixed before this batch can feed the model.`,
    };
  }
  if (report.counts.warning > 0) {
    return {
      tone: "ochre",
      text: `Usable with care: no blockers, ${countOf(report.counts.warning, "warning")} for the analyst to weigh.`,
    };
  }
  return { tone: "reed", text: "Passes the checks: no blockers or warnings for the analyst to weigh." };
}

export function Caution() {
  return (
    <p className="rounded border border-silt-line bg-white px-3 py-2 text-sm text-ink-soft" role="note">
      These checks support the analyst&apos;s judgement; they do not replace it. A batch with no findings can
      still be wrong in ways no check can see — units, mislabelled plots, a sample that is not what it claims
      — and the fit preview is a sanity check on this batch alone, not the analysis.
    </p>
  );
}

export function ReportView({
  report,
  plan,
  csvPrefix,
  findingStatus,
}: {
  report: ReadinessReport;
  plan: unknown;
  csvPrefix: string;
  /** per finding key, how it compares with the previous version */
  findingStatus?: Map<string, "remains" | "new">;
}) {
  const parsed = parsePlan(plan);
  const t = parsed.ok ? thresholdsOf(parsed.plan) : DEFAULT_THRESHOLDS;
  const intercept = parsed.ok ? parsed.plan.intercept : true;
  const verdict = verdictOf(report);
  const rows: FindingRow[] = report.findings.map((f, i) => ({
    ...f,
    id: `${i}`,
    ...(findingStatus ? { status: findingStatus.get(findingKey(f)) ?? "remains" } : {}),
  }));
  const toneClass = {
    clay: "border-clay bg-clay-wash text-clay-ink",
    ochre: "border-ochre bg-ochre-wash text-ochre-ink",
    reed: "border-reed bg-reed-wash text-reed-ink",
  }[verdict.tone];
  const planned = report.columns
    .filter((c) => c.role === "response" || c.role === "predictor")
    .map((c) => c.name);
  const coll = report.collinearity;

  return (
    <div className="grid grid-cols-1 gap-2">
      <div className={`mb-4 rounded border-l-4 px-4 py-3 ${toneClass}`} data-testid="verdict">
        <p className="text-md font-semibold">{verdict.text}</p>
        <div className="mt-2 flex flex-wrap items-center gap-3">
          <SeverityBadge severity="blocker" count={report.counts.blocker} />
          <SeverityBadge severity="warning" count={report.counts.warning} />
          <SeverityBadge severity="note" count={report.counts.note} />
          <span className="text-sm text-ink tabular-nums">
            n = {formatCount(report.rows.complete)} complete of {formatCount(report.rows.total)} rows · p ={" "}
            {report.model.parameters} · residual df {formatCount(report.model.residualDf)} ·{" "}
            {formatNumber(report.model.perParameter, "estimate")} rows per parameter
          </span>
        </div>
      </div>

      {report.status === "checked" ? (
        <Section
          title="Degrees of freedom"
          note="Can this batch carry the planned model on its own? The bar splits the complete cases into what the model uses and what is left as residual df."
          id="ledger"
        >
          <DfLedger data={ledgerOf(report, intercept)} label="This batch" />
        </Section>
      ) : null}

      <Section
        title="Findings"
        id="findings"
        note="Row numbers count the header as row 1, as a spreadsheet shows them."
      >
        <FindingsTable findings={rows} csvName={`${csvPrefix}-findings`} commentable />
      </Section>

      {report.status === "checked" ? (
        <>
          <Section title="Columns" id="columns">
            <ColumnsTable
              columns={report.columns}
              findings={report.findings}
              csvName={`${csvPrefix}-columns`}
            />
          </Section>

          <Section
            title="Collinearity"
            id="collinearity"
            note="On the complete cases of the planned design. VIF for one-column terms; GVIF^(1/(2·df)) for terms with several columns (Fox & Monette 1992), comparable to √VIF."
          >
            {coll ? (
              <CollinearityPanel coll={coll} thresholds={t} csvName={`${csvPrefix}-collinearity`} />
            ) : (
              <p className="text-sm text-silt-ink">
                Not computed: too few complete rows for the planned design.
              </p>
            )}
          </Section>

          <Section
            title="Missingness"
            id="missingness"
            note={
              report.missingness.littleMCAR
                ? `Little's MCAR test: χ² = ${formatNumber(report.missingness.littleMCAR.statistic, "statistic")} on ${report.missingness.littleMCAR.df} df, p ${pEquals(report.missingness.littleMCAR.pValue)}. A small p says the values are not missing completely at random.`
                : undefined
            }
          >
            <MissingnessMap
              patterns={report.missingness.patterns}
              overflow={report.missingness.patternsOverflow}
              columns={planned}
              total={report.rows.total}
            />
          </Section>

          <Section
            title="Fit preview"
            id="fit"
            note="Least squares on this batch's complete cases — a sanity check, not the analysis."
          >
            {report.fit ? (
              <FitSummary fit={report.fit} csvName={`${csvPrefix}-coefficients`} />
            ) : (
              <p className="text-sm text-silt-ink">
                No fit: the model has no residual degrees of freedom on this batch.
              </p>
            )}
          </Section>
        </>
      ) : null}
      <Caution />
    </div>
  );
}

/** A finding's identity across versions: its code and columns. */
export function findingKey(f: { code: string; columns: string[] }): string {
  return `${f.code}|${[...f.columns].sort().join(",")}`;
}
