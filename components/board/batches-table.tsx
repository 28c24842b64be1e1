"use client";
/** Every batch's newest version with its state and how long it has sat there. */
import { LocalTime } from "@/components/ui/local-time";
import Link from "next/link";
import { DataTable, type Column } from "@/components/data-table";
import { StateBadge } from "@/components/state-badge";
import { batchStateLabel } from "@/lib/format";
import { formatHours } from "./format";

export type BoardBatchRow = {
  id: string;
  studyTitle: string;
  organisationName: string;
  batchPublicId: string;
  title: string;
  version: number;
  state: string;
  uploadedAt: string;
  stateChangedAt: string;
  hoursInState: number;
};

const columns: Column<BoardBatchRow>[] = [
  { key: "study", header: "Study", value: (r) => r.studyTitle, width: "minmax(10rem, 1.3fr)" },
  { key: "org", header: "Provider", value: (r) => r.organisationName, width: "minmax(9rem, 1.1fr)" },
  {
    key: "title",
    header: "Batch",
    value: (r) => r.title,
    render: (r) => (
      <Link className="text-channel underline" href={`/batches/${r.batchPublicId}?v=${r.version}`}>
        {r.title}
      </Link>
    ),
    width: "minmax(12rem, 2fr)",
  },
  { key: "version", header: "Version", value: (r) => r.version, numeric: true, width: "5rem" },
  {
    key: "state",
    header: "State",
    value: (r) => batchStateLabel(r.state),
    render: (r) => <StateBadge state={r.state} />,
    width: "9rem",
  },
  {
    key: "since",
    header: "In state since",
    value: (r) => r.stateChangedAt,
    render: (r) => <LocalTime value={r.stateChangedAt} />,
    width: "10rem",
  },
  {
    key: "hours",
    header: "Time in state (hours)",
    value: (r) => Number(r.hoursInState.toFixed(2)),
    render: (r) => formatHours(r.hoursInState),
    numeric: true,
    width: "9rem",
  },
];

export function BoardBatchesTable({ rows }: { rows: BoardBatchRow[] }) {
  return (
    <DataTable
      rows={rows}
      columns={columns}
      caption="Batches by state"
      csvName="board-batches"
      filterPlaceholder="Filter by study, provider, batch or state"
      empty="No batch has arrived yet."
    />
  );
}
