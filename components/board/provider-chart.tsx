"use client";
/** Bounce rate and versions per batch by provider organisation: bars for the rate, the numbers as a table. */
import { Bar, BarChart, CartesianGrid, ResponsiveContainer, Tooltip, XAxis, YAxis } from "recharts";
import { DataTable, type Column } from "@/components/data-table";
import type { ProviderStats } from "@/lib/pool/queries-board";
import { formatNumber } from "@/lib/format";
import { AXIS_TICK, CHART_GRID, NAME_TICK } from "@/components/ui/chart-style";

/** A row of the board's provider figures (lib/pool/queries-board.ts), keyed for the table. */
export type ProviderRow = Omit<ProviderStats, "studySlug"> & { id: string };

const pct = (x: number | null) => formatNumber(x, "percent");

const columns: Column<ProviderRow>[] = [
  { key: "study", header: "Study", value: (r) => r.studyTitle, width: "minmax(10rem, 1.5fr)" },
  { key: "org", header: "Provider", value: (r) => r.organisationName, width: "minmax(9rem, 1.2fr)" },
  { key: "batches", header: "Batches", value: (r) => r.batches, numeric: true, width: "6rem" },
  { key: "versions", header: "Versions", value: (r) => r.versions, numeric: true, width: "6rem" },
  {
    key: "vpb",
    header: "Versions per batch",
    value: (r) => (r.versionsPerBatch === null ? null : Number(r.versionsPerBatch.toFixed(2))),
    render: (r) => formatNumber(r.versionsPerBatch, "estimate"),
    numeric: true,
    width: "9rem",
  },
  { key: "accepted", header: "Accepted", value: (r) => r.accepted, numeric: true, width: "6.5rem" },
  { key: "bounced", header: "Bounced", value: (r) => r.bounced, numeric: true, width: "6.5rem" },
  {
    key: "rate",
    header: "Bounce rate",
    value: (r) => (r.bounceRate === null ? null : Number(r.bounceRate.toFixed(4))),
    render: (r) => pct(r.bounceRate),
    numeric: true,
    width: "7rem",
  },
];

export function ProviderChart({ rows }: { rows: ProviderRow[] }) {
  const decided = rows
    .filter((r) => r.bounceRate !== null)
    .map((r) => ({
      name: `${r.organisationName} · ${r.studyTitle}`,
      rate: Math.round((r.bounceRate ?? 0) * 100),
      vpb: r.versionsPerBatch,
    }));
  return (
    <div className="grid grid-cols-1 gap-4">
      {decided.length ? (
        <figure
          className="w-full max-w-4xl"
          style={{ height: 40 + 30 * decided.length }}
          aria-label="Bounce rate by provider organisation, per cent of decisions"
          data-testid="provider-chart"
        >
          <ResponsiveContainer width="100%" height="100%">
            <BarChart data={decided} layout="vertical" margin={{ top: 4, right: 24, bottom: 4, left: 8 }}>
              <CartesianGrid {...CHART_GRID} horizontal={false} />
              <XAxis
                type="number"
                domain={[0, 100]}
                ticks={[0, 25, 50, 75, 100]}
                unit=" %"
                tick={AXIS_TICK}
              />
              <YAxis type="category" dataKey="name" width={260} tick={NAME_TICK} />
              <Tooltip formatter={(v) => `${v} % bounced`} />
              <Bar dataKey="rate" name="bounce rate" fill="var(--t-clay)" isAnimationActive={false} />
            </BarChart>
          </ResponsiveContainer>
        </figure>
      ) : (
        <p className="text-sm text-silt-ink">
          No decision yet: bounce rates appear after the first accept or bounce.
        </p>
      )}
      <DataTable rows={rows} columns={columns} caption="Providers" csvName="board-providers" />
    </div>
  );
}
