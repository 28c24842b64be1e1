/** The report's pictures: correlation heatmap, missingness map, condition indices. */
import { formatCount, formatNumber } from "@/lib/format";
import { SeverityBadge } from "@/components/severity-badge";

/**
 * Diverging clay ↔ sand ↔ channel, r in [-1, 1], mixed from the scheme's custom properties
 * (app/globals.css) so the picture follows the light or dark scheme.
 */
function corrColour(r: number): string {
  const t = Math.max(-1, Math.min(1, r));
  const end = t >= 0 ? "var(--t-channel)" : "var(--t-clay)";
  return `color-mix(in srgb, ${end} ${Math.round(Math.abs(t) * 100)}%, var(--t-sand))`;
}

/**
 * The value's colour on its cell: ink on the paler cells, sand on the deeper ones. At |r| = 0.7 both
 * schemes keep WCAG contrast of at least 3.3:1 either side (computed from the palette's values).
 */
function corrTextColour(r: number): string {
  return Math.abs(r) > 0.7 ? "var(--t-sand)" : "var(--t-ink)";
}

export function CorrelationHeatmap({ columns, matrix }: { columns: string[]; matrix: number[][] }) {
  const n = columns.length;
  if (n < 2)
    return (
      <p className="text-sm text-silt-ink">Fewer than two predictor columns: no correlations to show.</p>
    );
  const cell = n <= 12 ? 44 : n <= 24 ? 26 : 14;
  const label = 130;
  const size = label + n * cell;
  const showValues = cell >= 40;
  return (
    <div className="relative overflow-x-auto">
      <svg
        width={size}
        height={size}
        role="img"
        aria-label={`Correlation matrix of ${n} design columns`}
        className="font-sans"
      >
        {columns.map((c, i) => (
          <text
            key={`r${c}`}
            x={label - 6}
            y={label + i * cell + cell / 2 + 3}
            fontSize="10"
            textAnchor="end"
            fill="var(--t-ink)"
          >
            {c.length > 22 ? `${c.slice(0, 21)}…` : c}
          </text>
        ))}
        {columns.map((c, j) => (
          <text
            key={`c${c}`}
            x={0}
            y={0}
            fontSize="10"
            fill="var(--t-ink)"
            transform={`translate(${label + j * cell + cell / 2 + 3}, ${label - 6}) rotate(-60)`}
          >
            {c.length > 22 ? `${c.slice(0, 21)}…` : c}
          </text>
        ))}
        {matrix.map((row, i) =>
          row.map((r, j) => (
            <g key={`${i}-${j}`}>
              <rect
                x={label + j * cell}
                y={label + i * cell}
                width={cell - 1}
                height={cell - 1}
                style={{ fill: corrColour(r) }}
              >
                <title>{`${columns[i]} × ${columns[j]}: r = ${formatNumber(r, "statistic")}`}</title>
              </rect>
              {showValues && i !== j ? (
                <text
                  x={label + j * cell + cell / 2}
                  y={label + i * cell + cell / 2 + 3}
                  fontSize="10"
                  textAnchor="middle"
                  style={{ fill: corrTextColour(r) }}
                  className="tabular-nums"
                >
                  {formatNumber(Math.round(r * 100) / 100, "measure")}
                </text>
              ) : null}
            </g>
          )),
        )}
      </svg>
      <p className="mt-1 text-xs text-silt-ink">
        <span
          className="mr-1 inline-block h-2.5 w-6 align-middle"
          style={{ background: "linear-gradient(90deg, var(--t-clay), var(--t-sand), var(--t-channel))" }}
          aria-hidden="true"
        />
        r from −1 (clay) through 0 (sand) to +1 (channel), on the complete cases.
      </p>
    </div>
  );
}

/**
 * Rows of patterns (not raw rows): one row per missingness pattern, its count as a bar. Past the
 * engine's limit of distinct patterns (`overflow`) there are none to draw, and it says why.
 */
export function MissingnessMap({
  patterns,
  columns,
  total,
  overflow,
}: {
  patterns: { columns: string[]; count: number }[];
  columns: string[];
  total: number;
  overflow?: { limit: number };
}) {
  if (overflow)
    return (
      <p className="text-sm text-silt-ink">
        The rows with gaps fall into more than {overflow.limit.toLocaleString("en")} different combinations of
        missing columns: too scattered to draw. Each column&apos;s missing count is in the columns table.
      </p>
    );
  if (patterns.length === 0)
    return <p className="text-sm text-reed-ink">No missing values in the planned columns.</p>;
  const max = Math.max(1, ...patterns.map((p) => p.count));
  return (
    <div className="relative overflow-x-auto">
      <table className="border-collapse text-xs" aria-label="Missingness patterns">
        <thead>
          <tr>
            {columns.map((c) => (
              <th key={c} scope="col" className="h-28 w-6 align-bottom font-normal">
                <span className="inline-block origin-bottom-left translate-x-3 -rotate-60 whitespace-nowrap font-mono">
                  {c}
                </span>
              </th>
            ))}
            <th scope="col" className="pl-3 text-left align-bottom font-semibold">
              Rows
            </th>
          </tr>
        </thead>
        <tbody>
          {patterns.map((p, i) => (
            <tr key={i}>
              {columns.map((c) => {
                const missing = p.columns.includes(c);
                return (
                  <td key={c} className="p-px">
                    <span
                      className={`block h-4 w-5 ${missing ? "bg-clay" : "bg-shallows"}`}
                      title={`${c}: ${missing ? "missing" : "present"}`}
                    >
                      <span className="sr-only">{missing ? `${c} missing` : ""}</span>
                    </span>
                  </td>
                );
              })}
              <td className="pl-3">
                <span className="flex items-center gap-2 tabular-nums">
                  <span
                    className="inline-block h-3 bg-slate"
                    style={{ width: `${Math.max(2, (p.count / max) * 160)}px` }}
                    aria-hidden="true"
                  />
                  {formatCount(p.count)} ({formatNumber(p.count / Math.max(1, total), "percent")})
                </span>
              </td>
            </tr>
          ))}
        </tbody>
      </table>
      <p className="mt-1 text-xs text-silt-ink">
        Filled cells are missing. Rows with no missing value in these columns are not drawn.
      </p>
    </div>
  );
}

/** Condition indices with the design columns whose variance they carry (Belsley, Kuh & Welsch 1980). */
export function ConditionIndices({
  indices,
  proportions,
  threshold,
  share,
}: {
  indices: number[];
  proportions: { columns: string[]; matrix: number[][] };
  threshold: number;
  share: number;
}) {
  if (indices.length === 0) return null;
  return (
    <div className="relative overflow-x-auto">
      <table className="text-sm" aria-label="Condition indices">
        <thead>
          <tr className="text-left">
            <th className="pr-4 font-semibold">Dimension</th>
            <th className="pr-4 text-right font-semibold">Condition index</th>
            <th className="font-semibold">Columns with more than {share} of their variance here</th>
          </tr>
        </thead>
        <tbody>
          {indices.map((eta, k) => {
            const cols = (proportions.matrix[k] ?? [])
              .map((v, j) => (v > share ? proportions.columns[j] : null))
              .filter(Boolean);
            const high = eta >= threshold && cols.length >= 2;
            return (
              <tr key={k} className={high ? "text-ochre-ink" : undefined}>
                <td className="pr-4 tabular-nums">{k + 1}</td>
                <td className="pr-4 text-right tabular-nums">
                  {formatNumber(eta, "statistic")}
                  {high ? <SeverityBadge severity="warning" className="ml-2" /> : null}
                </td>
                <td className="font-mono text-xs">{cols.join(", ") || "—"}</td>
              </tr>
            );
          })}
        </tbody>
      </table>
    </div>
  );
}
