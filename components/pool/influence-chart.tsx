"use client";
/**
 * Batch influence: for each batch the largest shift of the pool's coefficients when it is left
 * out, in standard errors, as bars with the threshold drawn; the same figures as a table.
 */
import {
  Bar,
  BarChart,
  CartesianGrid,
  Cell,
  ReferenceLine,
  ResponsiveContainer,
  Tooltip,
  XAxis,
  YAxis,
} from "recharts";
import { DataTable, type Column } from "@/components/data-table";
import { formatCount } from "@/lib/format";
import type { InfluenceRow } from "@/lib/readiness";
import { countColumn, statColumn } from "./question-columns";
import { formatStat } from "./questions-format";
import { AXIS_TICK, CHART_GRID, NAME_TICK } from "@/components/ui/chart-style";

type Row = InfluenceRow & { id: string };

const signed = (x: number) => (x > 0 ? `+${formatCount(x)}` : formatCount(x));

const columns: Column<Row>[] = [
  { key: "label", header: "Batch", value: (r) => r.label, width: "minmax(12rem, 2fr)" },
  countColumn("n", "Complete rows", (r) => r.n, "7.5rem"),
  statColumn("shift", "Largest shift (SE)", (r) => r.largest?.shift, "8.5rem"),
  {
    key: "column",
    header: "Of the column",
    value: (r) => r.largest?.column ?? "",
    render: (r) => <span className="font-mono text-xs">{r.largest?.column ?? "–"}</span>,
    width: "minmax(8rem, 1fr)",
  },
  statColumn("r2with", "R² with", (r) => r.with.r2, "6rem", 4, true),
  statColumn("r2without", "R² without", (r) => r.without.r2, "6.5rem", 4, true),
  countColumn("dfwith", "Residual df with", (r) => r.with.residualDf, "8rem"),
  countColumn("dfwithout", "Residual df without", (r) => r.without.residualDf, "9rem"),
  {
    key: "headroom",
    header: "Headroom without",
    value: (r) => r.without.headroom,
    render: (r) => signed(r.without.headroom),
    numeric: true,
    width: "8.5rem",
  },
  { key: "flag", header: "Influential", value: (r) => (r.influential ? "yes" : "no"), width: "6.5rem" },
];

export function InfluenceChart({
  rows,
  threshold,
  csvName,
  caption = "Influence of each batch",
}: {
  rows: InfluenceRow[];
  threshold: number;
  csvName: string;
  caption?: string;
}) {
  const data = rows.map((r) => ({
    id: r.id,
    name: r.label,
    shift: r.largest?.shift ?? 0,
    term: r.largest?.column ?? "",
    influential: r.influential,
  }));
  const top = Math.max(threshold * 1.5, ...data.map((d) => d.shift));
  const summary = data
    .map((d) => `${d.name}: ${formatStat(d.shift)} SE${d.influential ? ", at or above the threshold" : ""}`)
    .join("; ");
  return (
    <div className="grid grid-cols-1 gap-4">
      {data.length ? (
        <figure
          className="w-full max-w-4xl"
          style={{ height: 60 + 32 * data.length }}
          aria-label={`Largest coefficient shift when each batch is left out, in standard errors; threshold ${formatStat(threshold)} SE. ${summary}.`}
          data-testid="influence-chart"
        >
          <ResponsiveContainer width="100%" height="100%">
            <BarChart data={data} layout="vertical" margin={{ top: 16, right: 32, bottom: 16, left: 8 }}>
              <CartesianGrid {...CHART_GRID} horizontal={false} />
              <XAxis
                type="number"
                domain={[0, Math.ceil(top * 10) / 10]}
                tick={AXIS_TICK}
                label={{
                  value: "largest shift, standard errors",
                  position: "insideBottom",
                  offset: -10,
                  fontSize: 12,
                  fill: "var(--t-silt-ink)",
                }}
              />
              <YAxis type="category" dataKey="name" width={240} tick={NAME_TICK} />
              <Tooltip
                formatter={(v, _n, item) => [
                  `${formatStat(typeof v === "number" ? v : null)} SE (${(item.payload as { term: string }).term})`,
                  "largest shift",
                ]}
              />
              <Bar dataKey="shift" name="largest shift" isAnimationActive={false}>
                {data.map((d) => (
                  <Cell key={d.id} fill={d.influential ? "var(--t-ochre)" : "var(--t-channel)"} />
                ))}
              </Bar>
              <ReferenceLine
                x={threshold}
                stroke="var(--t-ink)"
                strokeWidth={2}
                strokeDasharray="4 3"
                label={{
                  value: `${formatStat(threshold)} SE`,
                  position: "top",
                  fontSize: 12,
                  fill: "var(--t-ink)",
                }}
              />
            </BarChart>
          </ResponsiveContainer>
        </figure>
      ) : null}
      <DataTable
        rows={rows.map((r) => ({ ...r, id: r.id }))}
        columns={columns}
        caption={caption}
        csvName={csvName}
        empty="No accepted batch yet."
      />
    </div>
  );
}
