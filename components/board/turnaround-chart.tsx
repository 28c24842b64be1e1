"use client";
/** Turnaround from upload to decision by week: median and 90th percentile as lines, and as a table. */
import { Legend, Line, LineChart, ResponsiveContainer, Tooltip } from "recharts";
import { DataTable, type Column } from "@/components/data-table";
import { formatCount, niceTicks } from "@/lib/format";
import { formatHours } from "./format";
import { LINE_MARGIN } from "@/components/ui/chart-style";
import { weekAxes } from "@/components/ui/week-axes";

export type TurnaroundRow = {
  week: string;
  decisions: number;
  medianHours: number | null;
  p90Hours: number | null;
};

const columns: Column<TurnaroundRow & { id: string }>[] = [
  { key: "week", header: "Week from (Monday)", value: (r) => r.week, width: "10rem" },
  { key: "n", header: "Decisions", value: (r) => r.decisions, numeric: true, width: "7rem" },
  {
    key: "median",
    header: "Median (hours)",
    value: (r) => (r.medianHours === null ? null : Number(r.medianHours.toFixed(2))),
    render: (r) => formatHours(r.medianHours),
    numeric: true,
    width: "9rem",
  },
  {
    key: "p90",
    header: "90th percentile (hours)",
    value: (r) => (r.p90Hours === null ? null : Number(r.p90Hours.toFixed(2))),
    render: (r) => formatHours(r.p90Hours),
    numeric: true,
    width: "11rem",
  },
];

export function TurnaroundChart({ weeks }: { weeks: TurnaroundRow[] }) {
  const data = weeks.map((w) => ({ ...w, id: w.week, label: w.week.slice(5) }));
  const any = weeks.some((w) => w.decisions > 0);
  // whole hours, 1-2-2.5-5 steps: distinct labels whatever the spread
  const ticks = niceTicks(0, Math.max(1, ...weeks.map((w) => w.p90Hours ?? 0)), 5, true);
  return (
    <div className="grid grid-cols-1 gap-4">
      {any ? (
        <figure
          className="h-64 w-full max-w-4xl"
          aria-label="Turnaround from upload to decision by week, median and 90th percentile in hours"
          data-testid="turnaround-chart"
        >
          <ResponsiveContainer width="100%" height="100%">
            <LineChart data={data} margin={LINE_MARGIN}>
              {weekAxes({ ticks, format: (v) => `${formatCount(v)} h`, width: 64 })}
              <Tooltip formatter={(v) => formatHours(typeof v === "number" ? v : null)} />
              <Legend wrapperStyle={{ fontSize: 12 }} />
              <Line
                type="monotone"
                dataKey="medianHours"
                name="median"
                stroke="var(--t-channel)"
                strokeWidth={2}
                connectNulls
                dot={{ r: 3 }}
                isAnimationActive={false}
              />
              <Line
                type="monotone"
                dataKey="p90Hours"
                name="90th percentile"
                stroke="var(--t-ochre)"
                strokeWidth={2}
                strokeDasharray="5 3"
                connectNulls
                dot={{ r: 3, strokeDasharray: "" }}
                isAnimationActive={false}
              />
            </LineChart>
          </ResponsiveContainer>
        </figure>
      ) : (
        <p className="text-sm text-silt-ink">No decision in the period yet.</p>
      )}
      <DataTable rows={data} columns={columns} caption="Turnaround by week" csvName="board-turnaround" />
    </div>
  );
}
