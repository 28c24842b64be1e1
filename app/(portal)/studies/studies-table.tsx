"use client";

import Link from "next/link";
import { DataTable, type Column } from "@/components/data-table";
import { Badge } from "@/components/ui/badge";

export type StudiesRow = {
  id: number;
  slug: string;
  title: string;
  team: string | null;
  status: "open" | "closed";
  planVersion: number | null;
  providers: string[];
  analysts: string[];
};

/** The studies list: status, plan version, providers and analysts; each title opens the study. */
export function StudiesTable({ rows, showAnalysts }: { rows: StudiesRow[]; showAnalysts: boolean }) {
  const columns: Column<StudiesRow>[] = [
    {
      key: "title",
      header: "Study",
      width: "minmax(15rem, 3fr)",
      value: (r) => r.title,
      render: (r) => (
        <span className="block">
          <Link href={`/studies/${r.slug}`} className="font-semibold">
            {r.title}
          </Link>
          <span className="block font-mono text-xs text-silt-ink">{r.slug}</span>
        </span>
      ),
    },
    { key: "team", header: "Run by", width: "minmax(10rem, 2fr)", value: (r) => r.team },
    {
      key: "status",
      header: "Status",
      width: "6rem",
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
      width: "6.5rem",
      numeric: true,
      value: (r) => r.planVersion,
      render: (r) =>
        r.planVersion == null ? <span className="text-silt-ink">none yet</span> : `v${r.planVersion}`,
    },
    {
      key: "providers",
      header: "Provider organisations",
      width: "minmax(12rem, 3fr)",
      value: (r) => r.providers.join("; "),
      render: (r) =>
        r.providers.length === 0 ? (
          <span className="text-silt-ink">none admitted</span>
        ) : (
          <span>
            <span className="font-semibold tabular">{r.providers.length}</span>{" "}
            <span className="text-ink-soft">— {r.providers.join(", ")}</span>
          </span>
        ),
    },
  ];
  if (showAnalysts) {
    columns.push({
      key: "analysts",
      header: "Analysts",
      width: "minmax(10rem, 2fr)",
      value: (r) => r.analysts.join("; "),
      render: (r) =>
        r.analysts.length === 0 ? (
          <span className="text-silt-ink">none assigned</span>
        ) : (
          r.analysts.join(", ")
        ),
    });
  }
  return <DataTable rows={rows} columns={columns} caption="Studies" filterPlaceholder="Filter studies" />;
}
