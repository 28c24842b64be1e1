"use client";
/**
 * The selection criteria against subset size: one small chart per criterion (their scales
 * differ), each marking the size it picks, and the leave-one-batch-out prediction error as a
 * curve; the table below holds every figure of the charts.
 */
import {
  CartesianGrid,
  Line,
  LineChart,
  ReferenceLine,
  ResponsiveContainer,
  Tooltip,
  XAxis,
  YAxis,
} from "recharts";
import { DataTable, type Column } from "@/components/data-table";
import { formatCount } from "@/lib/format";
import type { SelectionPreview } from "@/lib/readiness";
import { statColumn, termsColumn } from "./question-columns";
import { formatStat } from "./questions-format";
import { CHART_GRID, SMALL_TICK } from "@/components/ui/chart-style";

type Criterion = "adjR2" | "cp" | "aic" | "bic" | "lobo";
type Point = { size: number; adjR2: number; cp: number; aic: number; bic: number; lobo: number | null };

const LABEL: Record<Criterion, string> = {
  adjR2: "Adjusted R² (largest is best)",
  cp: "Mallows' Cp (smallest is best)",
  aic: "AIC (smallest is best)",
  bic: "BIC (smallest is best)",
  lobo: "Leave-one-batch-out mean squared prediction error (smallest is best)",
};

function SmallChart({
  data,
  field,
  pick,
  testId,
}: {
  data: Point[];
  field: Criterion;
  pick: number | undefined;
  testId: string;
}) {
  const values = data.map((d) => d[field]).filter((v): v is number => v !== null && Number.isFinite(v));
  const described = data
    .map((d) => `size ${d.size}: ${formatStat(d[field], field === "adjR2" ? 4 : 2)}`)
    .join("; ");
  return (
    <figure
      className="h-48 w-full"
      aria-label={`${LABEL[field]} by subset size${pick === undefined ? "" : `; picks size ${pick}`}. ${described}.`}
      data-testid={testId}
    >
      <figcaption className="mb-1 text-sm font-semibold">{LABEL[field]}</figcaption>
      <ResponsiveContainer width="100%" height="85%">
        <LineChart data={data} margin={{ top: 4, right: 12, bottom: 4, left: 4 }}>
          <CartesianGrid {...CHART_GRID} />
          <XAxis dataKey="size" tick={SMALL_TICK} allowDecimals={false} />
          <YAxis
            domain={values.length ? ["auto", "auto"] : [0, 1]}
            tick={SMALL_TICK}
            width={56}
            tickFormatter={(v: number) => formatStat(v, field === "adjR2" ? 3 : 1)}
          />
          <Tooltip
            formatter={(v) => formatStat(typeof v === "number" ? v : null, 4)}
            labelFormatter={(l) => `size ${l}`}
          />
          {pick === undefined ? null : (
            <ReferenceLine
              x={pick}
              stroke="var(--t-ochre)"
              strokeDasharray="4 3"
              label={{ value: "pick", position: "top", fontSize: 11, fill: "var(--t-ochre)" }}
            />
          )}
          <Line
            type="monotone"
            dataKey={field}
            stroke="var(--t-channel)"
            strokeWidth={2}
            dot={{ r: 3 }}
            connectNulls
            isAnimationActive={false}
          />
        </LineChart>
      </ResponsiveContainer>
    </figure>
  );
}

type Row = Point & { id: string; terms: string[]; parameters: number; rss: number; r2: number };

const columns: Column<Row>[] = [
  { key: "size", header: "Size", value: (r) => r.size, numeric: true, width: "4.5rem" },
  termsColumn("terms", "Best terms of this size", (r) => r.terms),
  { key: "k", header: "Coefficients", value: (r) => r.parameters, numeric: true, width: "7rem" },
  statColumn("rss", "RSS", (r) => r.rss, "7rem", 3),
  statColumn("r2", "R²", (r) => r.r2, "5.5rem", 4, true),
  statColumn("adj", "Adjusted R²", (r) => r.adjR2, "7rem", 4, true),
  statColumn("cp", "Cp", (r) => r.cp, "6rem"),
  statColumn("aic", "AIC", (r) => r.aic, "6.5rem"),
  statColumn("bic", "BIC", (r) => r.bic, "6.5rem"),
  statColumn("lobo", "LOBO MSPE", (r) => r.lobo, "7.5rem", 4),
];

export function CriteriaCharts({ selection, csvName }: { selection: SelectionPreview; csvName: string }) {
  const rows: Row[] = selection.bySize.map((m) => ({
    ...m,
    id: String(m.size),
    lobo: selection.lobo?.mspe[m.size] ?? null,
  }));
  const pick = (c: Criterion) => selection.picks.find((p) => p.criterion === c)?.size;
  return (
    <div className="grid grid-cols-1 gap-4">
      <div className="grid grid-cols-1 gap-4 md:grid-cols-2 xl:grid-cols-4" data-testid="criteria-chart">
        {(["adjR2", "cp", "aic", "bic"] as const).map((c) => (
          <SmallChart key={c} data={rows} field={c} pick={pick(c)} testId={`criterion-${c}`} />
        ))}
      </div>
      {selection.lobo ? (
        <div className="max-w-2xl">
          <SmallChart data={rows} field="lobo" pick={selection.lobo.size ?? undefined} testId="cv-curve" />
          <p className="mt-1 text-sm text-silt-ink">
            Each of the {formatCount(selection.lobo.folds)} accepted batches predicted by the model fitted on
            the others.
          </p>
        </div>
      ) : (
        <p className="text-sm text-silt-ink" data-testid="cv-curve-missing">
          Leave-one-batch-out cross-validation needs at least three accepted batches.
        </p>
      )}
      <DataTable
        rows={rows}
        columns={columns}
        caption={selection.exhaustive ? "Best subset of each size" : "Models of the forward path"}
        csvName={csvName}
      />
    </div>
  );
}
