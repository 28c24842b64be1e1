"use client";

import Link from "next/link";
import { DataTable, type Column } from "@/components/data-table";
import { Badge } from "@/components/ui/badge";
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
  const columns: Column<StudyRow>[] = [
    {
      key: "title",
      header: "Study",
      width: "minmax(12rem, 3fr)",
      value: (r) => r.title,
      render: (r) => (
        <span className="block">
          <Link
            href={`/studies/${r.slug}`}
            className="block font-semibold text-channel underline-offset-2 hover:underline"
          >
            {r.title}
          </Link>
          <span className="block font-mono text-xs text-silt-ink">{r.slug}</span>
        </span>
      ),
    },
    { key: "team", header: "Run by", width: "minmax(8rem, 2fr)", value: (r) => r.team },
    {
      key: "status",
      header: "Status",
      width: "5.5rem",
      value: (r) => r.status,
      render: (r) => (
        <Badge tone={r.status === "open" ? "channel" : "neutral"}>
          {r.status === "open" ? "Open" : "Closed"}
        </Badge>
      ),
    },
    {
      key: "plan",
      header: "Data plan",
      width: "5.5rem",
      numeric: true,
      value: (r) => r.planVersion,
      render: (r) => (r.planVersion == null ? "none" : `v${r.planVersion}`),
    },
  ];
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
