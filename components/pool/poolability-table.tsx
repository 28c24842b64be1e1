"use client";
/** Chow tests of each batch and each provider against the rest of the pool, with the practical size beside p. */
import { DataTable, type Column } from "@/components/data-table";
import { SeverityShape } from "@/components/severity-badge";
import type { ChowRow } from "@/lib/readiness";
import { countColumn, statColumn } from "./question-columns";
import { formatDf, formatP, formatStat, rounded } from "./questions-format";

export type PoolabilityRow = ChowRow & { of: "batch" | "provider" | "under review"; key: string };

function columns(threshold: number): Column<PoolabilityRow & { id: string }>[] {
  return [
    { key: "of", header: "Of", value: (r) => r.of, width: "7rem" },
    { key: "label", header: "Batch or provider", value: (r) => r.label, width: "minmax(12rem, 2fr)" },
    countColumn("n", "Complete rows", (r) => r.n, "7.5rem"),
    {
      key: "kind",
      header: "Test",
      value: (r) => (r.kind === "chow" ? "Chow" : "Chow predictive"),
      width: "9rem",
    },
    statColumn("F", "F", (r) => r.F, "6rem"),
    { key: "df", header: "df", value: (r) => formatDf(r.df1, r.df2), numeric: true, width: "7rem" },
    { key: "p", header: "p", value: (r) => r.p, render: (r) => formatP(r.p), numeric: true, width: "6.5rem" },
    {
      key: "shift",
      header: "Largest shift (SE)",
      value: (r) => rounded(r.largest?.shift ?? null, 3),
      render: (r) =>
        r.largest ? (
          <span className="inline-flex items-center gap-1">
            {r.largest.shift >= threshold ? <SeverityShape severity="warning" /> : null}
            {formatStat(r.largest.shift)}
            <span className="sr-only">
              {r.largest.shift >= threshold ? " (one standard error or more)" : ""}
            </span>
          </span>
        ) : (
          "–"
        ),
      numeric: true,
      width: "8.5rem",
    },
    {
      key: "term",
      header: "Of the term",
      value: (r) => r.largest?.term ?? "",
      render: (r) => <span className="font-mono text-xs">{r.largest?.term ?? "–"}</span>,
      width: "minmax(8rem, 1fr)",
    },
    { key: "words", header: "In words", value: (r) => r.words, width: "minmax(16rem, 3fr)" },
  ];
}

export function PoolabilityTable({
  rows,
  threshold,
  csvName,
}: {
  rows: PoolabilityRow[];
  threshold: number;
  csvName: string;
}) {
  return (
    <DataTable
      rows={rows.map((r) => ({ ...r, id: r.key }))}
      columns={columns(threshold)}
      caption="Poolability of each batch and provider"
      csvName={csvName}
      empty="No accepted batch yet: there is nothing to compare."
    />
  );
}
