"use client";
/** Selection stability: the share of leave-one-batch-out fits whose chosen model holds each candidate, 20 % and 80 % drawn. */
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
import type { SelectionPreview } from "@/lib/readiness";
import { formatShare, rounded } from "./questions-format";
import { AXIS_TICK, CHART_GRID, NAME_TICK } from "@/components/ui/chart-style";

type Stability = NonNullable<SelectionPreview["stability"]>;
type Row = { id: string; term: string; share: number };

const unstable = (s: number) => s > 0.2 && s < 0.8;

const columns: Column<Row>[] = [
  {
    key: "term",
    header: "Candidate",
    value: (r) => r.term,
    render: (r) => <span className="font-mono text-xs">{r.term}</span>,
    width: "minmax(10rem, 2fr)",
  },
  {
    key: "share",
    header: "Chosen in",
    value: (r) => rounded(r.share),
    render: (r) => formatShare(r.share),
    numeric: true,
    width: "7rem",
  },
  {
    key: "reading",
    header: "Reading",
    value: (r) => (r.share >= 0.8 ? "stable: in" : r.share <= 0.2 ? "stable: out" : "unstable"),
    width: "8rem",
  },
];

export function StabilityBars({ stability, csvName }: { stability: Stability; csvName: string }) {
  const rows = stability.shares.map((s) => ({ id: s.term, term: s.term, share: s.share }));
  const data = rows.map((r) => ({ ...r, pct: Math.round(r.share * 100) }));
  return (
    <div className="grid grid-cols-1 gap-4">
      <figure
        className="w-full max-w-3xl"
        style={{ height: 60 + 28 * data.length }}
        aria-label={`Share of the ${stability.folds} leave-one-batch-out fits whose BIC-chosen model contains each candidate: ${data.map((d) => `${d.term} ${d.pct} %`).join("; ")}. Between 20 % and 80 % counts as unstable.`}
        data-testid="stability-bars"
      >
        <ResponsiveContainer width="100%" height="100%">
          <BarChart data={data} layout="vertical" margin={{ top: 16, right: 24, bottom: 4, left: 8 }}>
            <CartesianGrid {...CHART_GRID} horizontal={false} />
            <XAxis type="number" domain={[0, 100]} unit=" %" tick={AXIS_TICK} />
            <YAxis type="category" dataKey="term" width={180} tick={NAME_TICK} />
            <Tooltip formatter={(v) => `${v} % of the fits`} />
            <Bar dataKey="pct" name="chosen in" isAnimationActive={false}>
              {data.map((d) => (
                <Cell key={d.id} fill={unstable(d.share) ? "var(--t-ochre)" : "var(--t-channel)"} />
              ))}
            </Bar>
            <ReferenceLine
              x={20}
              stroke="var(--t-silt)"
              strokeDasharray="4 3"
              label={{ value: "20 %", position: "top", fontSize: 11, fill: "var(--t-silt-ink)" }}
            />
            <ReferenceLine
              x={80}
              stroke="var(--t-silt)"
              strokeDasharray="4 3"
              label={{ value: "80 %", position: "top", fontSize: 11, fill: "var(--t-silt-ink)" }}
            />
          </BarChart>
        </ResponsiveContainer>
      </figure>
      <DataTable rows={rows} columns={columns} caption="Selection stability" csvName={csvName} />
    </div>
  );
}
