/** The pool's figures side by side: as it stands and with a batch added (or one column alone). */
import { formatCount, formatNumber } from "@/lib/format";
import type { ReadinessReport } from "@/lib/readiness";

type Figure = { label: string; of: (r: ReadinessReport) => number | null; digits?: number; signed?: boolean };

const FIGURES: Figure[] = [
  { label: "Rows", of: (r) => r.rows.total },
  { label: "Complete cases (n)", of: (r) => r.rows.complete },
  { label: "Parameters (p)", of: (r) => r.model.parameters },
  { label: "Residual df", of: (r) => r.model.residualDf },
  { label: "df headroom against target", of: (r) => r.model.residualDf - r.model.dfTarget, signed: true },
  { label: "Complete cases per parameter", of: (r) => r.model.perParameter, digits: 1 },
  { label: "R² of the fit preview", of: (r) => r.fit?.rSquared ?? null, digits: 4 },
  {
    label: "Largest scaled GVIF",
    of: (r) =>
      r.collinearity?.terms.length ? Math.max(...r.collinearity.terms.map((t) => t.gvifScaled)) : null,
    digits: 2,
  },
  { label: "Blockers", of: (r) => r.counts.blocker },
  { label: "Warnings", of: (r) => r.counts.warning },
];

function show(v: number | null, f: Figure): string {
  if (v === null || !Number.isFinite(v)) return "–";
  const s = f.digits ? formatNumber(v, "estimate") : formatCount(v);
  return f.signed && v > 0 ? `+${s}` : s;
}

export function PoolFigures({
  columns,
  caption,
}: {
  columns: { heading: string; report: ReadinessReport }[];
  caption: string;
}) {
  return (
    <table className="w-full max-w-2xl text-sm tabular-nums" data-testid="pool-figures">
      <caption className="sr-only">{caption}</caption>
      <thead>
        <tr className="border-b border-silt-line text-left">
          <th scope="col" className="py-1 pr-4 font-semibold">
            Figure
          </th>
          {columns.map((c) => (
            <th key={c.heading} scope="col" className="py-1 pr-4 text-right font-semibold">
              {c.heading}
            </th>
          ))}
        </tr>
      </thead>
      <tbody>
        {FIGURES.map((f) => (
          <tr key={f.label} className="border-b border-silt-line/50">
            <th scope="row" className="py-1 pr-4 text-left font-normal">
              {f.label}
            </th>
            {columns.map((c) => (
              <td key={c.heading} className="py-1 pr-4 text-right">
                {show(f.of(c.report), f)}
              </td>
            ))}
          </tr>
        ))}
      </tbody>
    </table>
  );
}
