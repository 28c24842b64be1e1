"use client";

import { LocalTime } from "@/components/ui/local-time";
import Link from "next/link";
import { DataTable, type Column } from "@/components/data-table";
import { StateBadge } from "@/components/state-badge";
import { EmptyState } from "@/components/ui/empty-state";

export type BatchRow = {
  id: number;
  publicId: string;
  title: string;
  studyTitle: string;
  organisationName: string;
  latestVersion: number;
  state: string | null;
  fileName: string | null;
  uploadedAt: Date | null;
  stateChangedAt: Date | null;
};

/** Batches with their latest version's state. `showProvider` adds the organisation column (analysts, leads). */
export function BatchTable({
  rows,
  caption,
  showProvider = false,
  emptyTitle,
  emptyText,
}: {
  rows: BatchRow[];
  caption: string;
  showProvider?: boolean;
  emptyTitle: string;
  emptyText: string;
}) {
  const columns: Column<BatchRow>[] = [
    {
      key: "title",
      header: "Batch",
      width: "minmax(12rem, 3fr)",
      value: (r) => r.title,
      render: (r) => (
        <Link
          href={`/batches/${r.publicId}`}
          className="font-semibold text-channel underline-offset-2 hover:underline"
        >
          {r.title}
        </Link>
      ),
    },
    { key: "study", header: "Study", width: "minmax(12rem, 3fr)", value: (r) => r.studyTitle },
  ];
  if (showProvider)
    columns.push({
      key: "provider",
      header: "Provider",
      width: "minmax(10rem, 2fr)",
      value: (r) => r.organisationName,
    });
  columns.push(
    { key: "version", header: "Version", numeric: true, width: "5rem", value: (r) => r.latestVersion },
    {
      key: "state",
      header: "State",
      width: "9rem",
      value: (r) => r.state,
      render: (r) =>
        r.state ? <StateBadge state={r.state} /> : <span className="text-silt-ink">no file yet</span>,
    },
    {
      key: "file",
      header: "File",
      width: "minmax(10rem, 2fr)",
      value: (r) => r.fileName,
      render: (r) => <span className="font-mono text-xs">{r.fileName ?? "–"}</span>,
    },
    {
      key: "changed",
      header: "State since",
      width: "11rem",
      value: (r) => r.stateChangedAt,
      render: (r) => <LocalTime value={r.stateChangedAt} className="tabular" />,
    },
  );
  return (
    <DataTable
      rows={rows}
      columns={columns}
      caption={caption}
      filterPlaceholder="Filter batches"
      empty={<EmptyState title={emptyTitle}>{emptyText}</EmptyState>}
    />
  );
}
