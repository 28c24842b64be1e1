"use client";
import { DataTable, type Column } from "@/components/data-table";
import { LocalTime } from "@/components/ui/local-time";

type Entry = { id: string; at: string; who: string; what: string; detail: string };

export function TrailTable({ entries, csvName }: { entries: Entry[]; csvName: string }) {
  const columns: Column<Entry>[] = [
    {
      key: "at",
      header: "When",
      width: "12rem",
      value: (e) => e.at,
      render: (e) => <LocalTime value={e.at} className="tabular" />,
    },
    { key: "what", header: "What", width: "12rem", value: (e) => e.what },
    { key: "who", header: "Who", width: "12rem", value: (e) => e.who },
    { key: "detail", header: "Detail", width: "minmax(16rem, 3fr)", value: (e) => e.detail },
  ];
  return (
    <DataTable
      rows={entries}
      columns={columns}
      caption="Audit trail"
      csvName={csvName}
      filterPlaceholder="Filter the trail"
    />
  );
}
