import { formatNumber } from "@/lib/format";

/**
 * A square matrix (correlations) as a table, behind a "Show as a table" disclosure: the text
 * alternative of a heatmap, read cell by cell with its row and column headers.
 */
export function MatrixTable({
  caption,
  labels,
  matrix,
}: {
  caption: string;
  labels: string[];
  matrix: number[][];
}) {
  if (labels.length < 2) return null;
  return (
    <details className="text-sm" data-testid="matrix-table">
      <summary className="w-fit cursor-pointer rounded font-semibold text-channel">Show as a table</summary>
      <div className="table-frame mt-2 rounded border border-silt-line">
        <table className="border-collapse text-xs tabular-nums">
          <caption className="sr-only">{caption}</caption>
          <thead className="bg-sand-deep">
            <tr>
              <td />
              {labels.map((c) => (
                <th key={c} scope="col" className="px-2 py-1 text-left font-mono font-semibold">
                  {c}
                </th>
              ))}
            </tr>
          </thead>
          <tbody>
            {matrix.map((row, i) => (
              <tr key={labels[i]} className="border-t border-silt-line bg-white">
                <th scope="row" className="px-2 py-1 text-left font-mono font-semibold">
                  {labels[i]}
                </th>
                {row.map((r, j) => (
                  <td key={labels[j]} className="num px-2 py-1">
                    {i === j ? "1" : formatNumber(Math.round(r * 100) / 100, "measure")}
                  </td>
                ))}
              </tr>
            ))}
          </tbody>
        </table>
      </div>
    </details>
  );
}
