/** Each study's pooled residual df against its target: one bar per study with a tick at the target, and the numbers beside it. */
import Link from "next/link";
import { formatCount } from "@/lib/format";

export type HeadroomRow = {
  studySlug: string;
  studyTitle: string;
  batches: number;
  completeCases: number;
  parameters: number;
  residualDf: number;
  dfTarget: number;
  headroom: number;
  error?: string;
};

export function PoolHeadroom({ rows }: { rows: HeadroomRow[] }) {
  const scale = Math.max(1, ...rows.map((r) => Math.max(r.residualDf, r.dfTarget))) * 1.1;
  return (
    <div className="table-frame">
      <table className="w-full max-w-5xl text-sm tabular-nums" data-testid="pool-headroom">
        <caption className="sr-only">Pooled residual df against each study&apos;s target</caption>
        <thead>
          <tr className="border-b border-silt-line text-left">
            <th className="py-1 pr-4">Study</th>
            <th className="py-1 pr-4 text-right">Accepted</th>
            <th className="py-1 pr-4 text-right">n</th>
            <th className="py-1 pr-4 text-right">p</th>
            <th className="py-1 pr-4 text-right">Residual df</th>
            <th className="py-1 pr-4 text-right">Target</th>
            <th className="py-1 pr-4 text-right">Headroom</th>
            <th className="w-1/3 py-1" aria-hidden="true" />
          </tr>
        </thead>
        <tbody>
          {rows.map((r) => (
            <tr key={r.studySlug} className="border-b border-silt-line/50">
              <td className="py-1 pr-4">
                <Link className="text-channel underline" href={`/pool/${r.studySlug}`}>
                  {r.studyTitle}
                </Link>
              </td>
              {r.error ? (
                <td colSpan={7} className="py-1 text-clay-ink">
                  {r.error}
                </td>
              ) : (
                <>
                  <td className="py-1 pr-4 text-right">{r.batches}</td>
                  <td className="py-1 pr-4 text-right">{formatCount(r.completeCases)}</td>
                  <td className="py-1 pr-4 text-right">{r.parameters}</td>
                  <td className="py-1 pr-4 text-right">{formatCount(r.residualDf)}</td>
                  <td className="py-1 pr-4 text-right">{formatCount(r.dfTarget)}</td>
                  <td
                    className={`py-1 pr-4 text-right ${r.headroom >= 0 ? "text-reed-ink" : "text-ochre-ink"}`}
                  >
                    {r.headroom >= 0 ? `+${formatCount(r.headroom)}` : `${formatCount(-r.headroom)} short`}
                  </td>
                  <td className="py-1">
                    <svg viewBox="0 0 200 14" className="h-3.5 w-full" aria-hidden="true">
                      <rect x="0" y="3" width="200" height="8" fill="var(--t-sand-deep)" />
                      <rect
                        x="0"
                        y="3"
                        width={(Math.max(0, r.residualDf) / scale) * 200}
                        height="8"
                        fill={r.headroom >= 0 ? "var(--t-reed)" : "var(--t-ochre)"}
                      />
                      <line
                        x1={(r.dfTarget / scale) * 200}
                        x2={(r.dfTarget / scale) * 200}
                        y1="0"
                        y2="14"
                        stroke="var(--t-ink)"
                        strokeWidth="2"
                      />
                    </svg>
                  </td>
                </>
              )}
            </tr>
          ))}
        </tbody>
      </table>
    </div>
  );
}
