"use client";

import { DataTable, type Column } from "@/components/data-table";
import { studyColumns } from "./study-columns";
import type { BatchState } from "@/db/schema";

export type StudyRow = {
  id: number;
  title: string;
  slug: string;
  team: string | null;
  status: "open" | "closed";
  planVersion: number | null;
  counts: Record<BatchState, number>;
  /** names of the provider organisations admitted (leads) */
  providers?: string[];
  providersAdmitted?: number;
};

const total = (r: StudyRow) => Object.values(r.counts).reduce((a, b) => a + b, 0);

function count(key: BatchState, header: string): Column<StudyRow> {
  return { key, header, numeric: true, width: "minmax(5rem, 1fr)", value: (r) => r.counts[key] };
}

/** Studies with their batches by state; the provider, analyst and lead homes show different columns. */
export function StudyTable({
  rows,
  variant,
  caption,
}: {
  rows: StudyRow[];
  variant: "provider" | "analyst" | "lead";
  caption: string;
}) {
  const columns: Column<StudyRow>[] = studyColumns<StudyRow>(true);
  if (variant === "lead") {
    columns.push({
      key: "providers",
      header: "Providers admitted",
      width: "minmax(12rem, 3fr)",
      value: (r) => (r.providers ?? []).join("; "),
      render: (r) => (
        <span>
          <span className="tabular font-semibold">{r.providersAdmitted ?? r.providers?.length ?? 0}</span>
          {r.providers?.length ? <span className="text-ink-soft"> — {r.providers.join(", ")}</span> : null}
        </span>
      ),
    });
  }
  columns.push(count("ready", "Awaiting review"), count("accepted", "Accepted"), count("bounced", "Bounced"));
  if (variant !== "analyst") columns.push(count("checking", "Checking"));
  columns.push({
    key: "total",
    header: variant === "provider" ? "Your batches" : "All batches",
    numeric: true,
    width: "minmax(5rem, 1fr)",
    value: total,
  });
  return <DataTable rows={rows} columns={columns} caption={caption} filterPlaceholder="Filter studies" />;
}
