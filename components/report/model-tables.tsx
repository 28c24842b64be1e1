"use client";
/** The report's model tables: coefficients, and collinearity by term. */
import { DataTable, type Column } from "@/components/data-table";
import { SeverityBadge } from "@/components/severity-badge";
import { formatNumber } from "@/lib/format";
import type { Coefficient } from "@/lib/readiness";

type CoefRow = Coefficient & { id: string };

export function CoefficientsTable({
  coefficients,
  csvName,
}: {
  coefficients: Coefficient[];
  csvName?: string;
}) {
  const rows: CoefRow[] = coefficients.map((c) => ({ ...c, id: c.term }));
  const num = (v: number | null) => formatNumber(v, "estimate");
  const columns: Column<CoefRow>[] = [
    {
      key: "term",
      header: "Term",
      width: "minmax(10rem, 2fr)",
      value: (c) => c.term,
      render: (c) => (
        <span className="font-mono text-xs">
          {c.term}
          {c.aliased ? " (aliased)" : ""}
        </span>
      ),
    },
    {
      key: "estimate",
      header: "Estimate",
      numeric: true,
      value: (c) => c.estimate,
      render: (c) => num(c.estimate),
    },
    {
      key: "se",
      header: "Std. error",
      numeric: true,
      value: (c) => c.stdError,
      render: (c) => num(c.stdError),
    },
    {
      key: "t",
      header: "t",
      numeric: true,
      value: (c) => c.t,
      render: (c) => formatNumber(c.t, "statistic"),
    },
    {
      key: "p",
      header: "p",
      numeric: true,
      value: (c) => c.pValue,
      render: (c) => formatNumber(c.pValue, "pvalue"),
    },
  ];
  return (
    <DataTable
      rows={rows}
      columns={columns}
      caption="Coefficients"
      collapsedRows={5}
      csvName={csvName}
      filterPlaceholder="Filter terms"
    />
  );
}

type TermRow = { id: string; term: string; df: number; vif?: number; gvif: number; gvifScaled: number };

export function CollinearityTable({
  terms,
  vifWarning,
  vifStrong,
  csvName,
}: {
  terms: Omit<TermRow, "id">[];
  vifWarning: number;
  vifStrong: number;
  csvName?: string;
}) {
  const rows: TermRow[] = terms.map((t) => ({ ...t, id: t.term }));
  const flag = (scaled: number) =>
    scaled * scaled >= vifStrong ? "strong" : scaled * scaled >= vifWarning ? "warning" : "";
  const columns: Column<TermRow>[] = [
    {
      key: "term",
      header: "Term",
      width: "minmax(10rem, 2fr)",
      value: (t) => t.term,
      render: (t) => <span className="font-mono text-xs">{t.term}</span>,
    },
    { key: "df", header: "df", numeric: true, width: "4rem", value: (t) => t.df },
    {
      key: "vif",
      header: "VIF",
      numeric: true,
      value: (t) => t.vif ?? null,
      render: (t) => formatNumber(t.vif, "statistic"),
    },
    {
      key: "gvif",
      header: "GVIF",
      numeric: true,
      value: (t) => t.gvif,
      render: (t) => formatNumber(t.gvif, "statistic"),
    },
    {
      key: "gvifScaled",
      header: "GVIF^(1/(2·df))",
      numeric: true,
      value: (t) => t.gvifScaled,
      render: (t) => formatNumber(t.gvifScaled, "statistic"),
    },
    {
      key: "flag",
      header: "Reading",
      width: "9rem",
      value: (t) => flag(t.gvifScaled),
      render: (t) => {
        const f = flag(t.gvifScaled);
        // the engine's collinear.vif / collinear.gvif findings are warnings at both levels; "strong" says which
        return f ? (
          <span className="inline-flex items-center gap-1">
            <SeverityBadge severity="warning" />
            <span className="text-xs text-ochre-ink">
              {f === "strong" ? `strong, ≥ ${vifStrong}` : `≥ ${vifWarning}`}
            </span>
          </span>
        ) : (
          <span className="text-silt-ink">—</span>
        );
      },
    },
  ];
  return (
    <DataTable
      rows={rows}
      columns={columns}
      caption="Collinearity by term"
      collapsedRows={5}
      csvName={csvName}
      filterPlaceholder="Filter terms"
    />
  );
}
