"use client";

import { DataTable, type Column } from "@/components/data-table";
import { studyColumns } from "@/components/home/study-columns";

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
    ...studyColumns<StudiesRow>(false),
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
