"use client";

import { DataTable, type Column } from "@/components/data-table";
import { Badge } from "@/components/ui/badge";
import type { PlanColumn } from "@/lib/readiness";

type Row = PlanColumn & { id: number; position: number };

const range = (c: PlanColumn) =>
  c.min === undefined && c.max === undefined ? "" : `${c.min ?? "−∞"} to ${c.max ?? "∞"}`;
const tokens = (list: string[] | undefined) =>
  (list ?? []).map((t) => (t === "" ? "(empty cell)" : t)).join(", ");

/** A data plan's columns as a readable table: role, type, levels with the baseline marked, range, missing tokens. */
export function PlanColumnsTable({ columns, version }: { columns: PlanColumn[]; version: number }) {
  const rows: Row[] = columns.map((c, i) => ({ ...c, id: i + 1, position: i + 1 }));
  const cols: Column<Row>[] = [
    { key: "position", header: "#", numeric: true, width: "3rem", value: (r) => r.position },
    {
      key: "name",
      header: "Column",
      width: "minmax(10rem, 2fr)",
      value: (r) => r.name,
      render: (r) => (
        <span className="block">
          <span className="block font-mono">{r.name}</span>
          {r.description ? <span className="block text-xs text-silt-ink">{r.description}</span> : null}
        </span>
      ),
    },
    {
      key: "role",
      header: "Role",
      width: "6.5rem",
      value: (r) => r.role,
      render: (r) => (
        <Badge tone={r.role === "response" ? "channel" : r.role === "predictor" ? "slate" : "neutral"}>
          {r.role}
        </Badge>
      ),
    },
    { key: "type", header: "Type", width: "6rem", value: (r) => r.type },
    {
      key: "levels",
      header: "Levels (baseline marked)",
      width: "minmax(12rem, 3fr)",
      value: (r) => {
        const base = r.baseline ?? r.levels?.[0];
        return (
          (r.levels ?? []).map((l) => (l === base ? `${l} (baseline)` : l)).join(", ") +
          (r.openLevels ? "; open list" : "")
        );
      },
      render: (r) => {
        if (r.type !== "category") return null;
        const base = r.baseline ?? r.levels?.[0];
        if (!r.levels?.length)
          return <span className="text-silt-ink">open list{base ? `, baseline ${base}` : ""}</span>;
        return (
          <span className="flex flex-wrap items-center gap-1">
            {r.levels.map((l) => (
              <span
                key={l}
                className={l === base ? "rounded-sm border border-channel px-1 font-semibold" : "px-1"}
              >
                {l}
                {l === base ? <span className="sr-only"> (baseline)</span> : null}
              </span>
            ))}
            {r.openLevels ? <span className="text-xs text-silt-ink">+ other levels allowed</span> : null}
          </span>
        );
      },
    },
    {
      key: "range",
      header: "Range",
      width: "8rem",
      value: range,
      render: (r) => <span className="tabular">{range(r)}</span>,
    },
    {
      key: "missing",
      header: "Missing tokens",
      width: "minmax(7rem, 1fr)",
      value: (r) => [tokens(r.missingTokens), ...(r.sentinels ?? []).map(String)].filter(Boolean).join(", "),
    },
  ];
  return (
    <DataTable
      rows={rows}
      columns={cols}
      caption={`Data plan version ${version} columns`}
      filterPlaceholder="Filter columns"
    />
  );
}
