"use client";

import { LocalTime } from "@/components/ui/local-time";
import { DataTable, type Column } from "@/components/data-table";
import { Badge } from "@/components/ui/badge";

export type PlanHistoryRow = {
  id: number;
  version: number;
  note: string | null;
  createdAt: string;
  createdByName: string | null;
  planHash: string;
  current: boolean;
};

/** The versions of a study's data plan: who published each, when, and why. */
export function PlanHistoryTable({ rows }: { rows: PlanHistoryRow[] }) {
  const cols: Column<PlanHistoryRow>[] = [
    {
      key: "version",
      header: "Version",
      numeric: true,
      width: "7rem",
      value: (r) => r.version,
      render: (r) => (
        <span className="inline-flex items-center gap-1.5">
          v{r.version}
          {r.current ? <Badge tone="channel">current</Badge> : null}
        </span>
      ),
    },
    {
      key: "when",
      header: "Published",
      width: "11rem",
      value: (r) => r.createdAt,
      render: (r) => <LocalTime value={r.createdAt} className="tabular" />,
    },
    { key: "who", header: "By", width: "minmax(9rem, 1fr)", value: (r) => r.createdByName ?? "" },
    {
      key: "note",
      header: "Note",
      width: "minmax(14rem, 3fr)",
      value: (r) => r.note ?? "",
      render: (r) => r.note ?? <span className="text-silt-ink">no note</span>,
    },
    {
      key: "hash",
      header: "Fingerprint",
      width: "7rem",
      value: (r) => r.planHash,
      render: (r) => (
        <span className="font-mono text-xs" title={r.planHash}>
          {r.planHash.slice(0, 10)}
        </span>
      ),
    },
  ];
  return (
    <DataTable rows={rows} columns={cols} caption="Data plan versions" filterPlaceholder="Filter versions" />
  );
}
