"use client";
/** The accepted versions that make up a pool: provider, batch, version, rows, decision time. */
import { LocalTime } from "@/components/ui/local-time";
import Link from "next/link";
import { DataTable, type Column } from "@/components/data-table";
import { formatCount } from "@/lib/format";

export type MemberRow = {
  id: string;
  organisationName: string;
  batchPublicId: string;
  batchTitle: string;
  version: number;
  fileName: string;
  rowsTotal: number;
  rowsComplete: number;
  residualDf: number;
  decidedAt: string | null;
  currentPlan: boolean;
};

const columns: Column<MemberRow>[] = [
  { key: "org", header: "Provider", value: (r) => r.organisationName, width: "minmax(9rem, 1.2fr)" },
  {
    key: "batch",
    header: "Batch",
    value: (r) => r.batchTitle,
    render: (r) => (
      <Link className="text-channel underline" href={`/batches/${r.batchPublicId}?v=${r.version}`}>
        {r.batchTitle}
      </Link>
    ),
    width: "minmax(12rem, 2fr)",
  },
  { key: "version", header: "Version", value: (r) => r.version, numeric: true, width: "5rem" },
  {
    key: "file",
    header: "File",
    value: (r) => r.fileName,
    render: (r) => <span className="font-mono text-xs">{r.fileName}</span>,
    width: "minmax(8rem, 1fr)",
  },
  {
    key: "rows",
    header: "Rows",
    value: (r) => r.rowsTotal,
    render: (r) => formatCount(r.rowsTotal),
    numeric: true,
    width: "6rem",
  },
  {
    key: "complete",
    header: "Complete",
    value: (r) => r.rowsComplete,
    render: (r) => formatCount(r.rowsComplete),
    numeric: true,
    width: "6.5rem",
  },
  { key: "df", header: "Residual df alone", value: (r) => r.residualDf, numeric: true, width: "8rem" },
  {
    key: "decided",
    header: "Accepted",
    value: (r) => r.decidedAt,
    render: (r) => <LocalTime value={r.decidedAt} />,
    width: "10rem",
  },
  {
    key: "plan",
    header: "Checked against",
    value: (r) => (r.currentPlan ? "current plan" : "older plan"),
    width: "8rem",
  },
];

export function MembersTable({ rows, csvName }: { rows: MemberRow[]; csvName: string }) {
  return (
    <DataTable
      rows={rows}
      columns={columns}
      caption="Accepted versions in the pool"
      csvName={csvName}
      empty="No version has been accepted yet."
    />
  );
}
