"use client";
/** Each study's pooled residual df at the end of each week, against the df target of its plan (a dashed line), and as a table. */
import { Line, LineChart, ReferenceLine, ResponsiveContainer, Tooltip } from "recharts";
import { DataTable, type Column } from "@/components/data-table";
import { formatCount, niceTicks } from "@/lib/format";
import { LINE_MARGIN } from "@/components/ui/chart-style";
import { weekAxes } from "@/components/ui/week-axes";

export type HeadroomSeries = {
  studySlug: string;
  studyTitle: string;
  dfTarget: number;
  history: { week: string; residualDf: number }[];
};

type Row = { id: string; week: string; study: string; residualDf: number; dfTarget: number };

const columns: Column<Row>[] = [
  { key: "week", header: "Week from (Monday)", value: (r) => r.week, width: "10rem" },
  { key: "study", header: "Study", value: (r) => r.study },
  {
    key: "df",
    header: "Residual df at week's end",
    value: (r) => r.residualDf,
    render: (r) => formatCount(r.residualDf),
    numeric: true,
    width: "12rem",
  },
  {
    key: "target",
    header: "Target",
    value: (r) => r.dfTarget,
    render: (r) => formatCount(r.dfTarget),
    numeric: true,
    width: "7rem",
  },
];

export function HeadroomChart({ series }: { series: HeadroomSeries[] }) {
  const rows: Row[] = series.flatMap((s) =>
    s.history.map((h) => ({
      id: `${s.studySlug}:${h.week}`,
      week: h.week,
      study: s.studyTitle,
      residualDf: h.residualDf,
      dfTarget: s.dfTarget,
    })),
  );
  return (
    <div className="grid grid-cols-1 gap-4">
      <div className="grid grid-cols-1 gap-4 md:grid-cols-2" data-testid="headroom-chart">
        {series.map((s) => {
          const data = s.history.map((h) => ({ ...h, label: h.week.slice(5) }));
          const ticks = niceTicks(
            0,
            Math.max(s.dfTarget, ...s.history.map((h) => h.residualDf)) * 1.05,
            5,
            true,
          );
          return (
            <figure
              key={s.studySlug}
              className="h-56 w-full"
              aria-label={`${s.studyTitle}: pooled residual df by week against the target of ${formatCount(s.dfTarget)}`}
            >
              <figcaption className="mb-1 text-sm font-semibold">{s.studyTitle}</figcaption>
              <ResponsiveContainer width="100%" height="90%">
                <LineChart data={data} margin={LINE_MARGIN}>
                  {weekAxes({ ticks, format: (v) => formatCount(v), width: 56 })}
                  <Tooltip formatter={(v) => formatCount(typeof v === "number" ? v : null)} />
                  <ReferenceLine
                    y={s.dfTarget}
                    stroke="var(--t-ink)"
                    strokeDasharray="6 3"
                    label={{
                      value: `target ${formatCount(s.dfTarget)}`,
                      position: "insideTopRight",
                      fontSize: 12,
                      fill: "var(--t-ink)",
                    }}
                  />
                  <Line
                    type="stepAfter"
                    dataKey="residualDf"
                    name="residual df"
                    stroke="var(--t-reed)"
                    strokeWidth={2}
                    dot={{ r: 3 }}
                    isAnimationActive={false}
                  />
                </LineChart>
              </ResponsiveContainer>
            </figure>
          );
        })}
      </div>
      <DataTable rows={rows} columns={columns} caption="Residual df by week" csvName="board-headroom" />
    </div>
  );
}
