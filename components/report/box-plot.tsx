/** A numeric column's five numbers as a small box plot (min, quartiles, median, max from the report) and as text. */
import { formatNumber } from "@/lib/format";
import type { ColumnReport } from "@/lib/readiness";

type Summary = NonNullable<ColumnReport["summary"]>;

const W = 120;
const H = 14;

/** Said beside quartiles the engine found from a bounded sample of the column (REPORT-FORMAT.md, `quartiles`). */
export const SAMPLED_QUARTILES = "from a uniform sample of the column's values: close, not exact";

/** Whiskers from min to max, the box from the lower to the upper quartile, a bar at the median. */
export function BoxPlot({ s, sampled = false }: { s: Summary; sampled?: boolean }) {
  const span = s.max - s.min;
  const x = (v: number) => (span > 0 ? ((v - s.min) / span) * (W - 2) + 1 : W / 2);
  const label = `min ${formatNumber(s.min, "measure")}, lower quartile ${formatNumber(s.q1, "measure")}, median ${formatNumber(s.median, "measure")}, upper quartile ${formatNumber(s.q3, "measure")}, max ${formatNumber(s.max, "measure")}${sampled ? ` (quartiles and median ${SAMPLED_QUARTILES})` : ""}`;
  return (
    <svg viewBox={`0 0 ${W} ${H}`} width={W} height={H} role="img" aria-label={label} className="shrink-0">
      <title>{label}</title>
      <line x1={x(s.min)} x2={x(s.max)} y1={H / 2} y2={H / 2} stroke="var(--t-silt-ink)" strokeWidth="1" />
      <line x1={x(s.min)} x2={x(s.min)} y1={3} y2={H - 3} stroke="var(--t-silt-ink)" strokeWidth="1" />
      <line x1={x(s.max)} x2={x(s.max)} y1={3} y2={H - 3} stroke="var(--t-silt-ink)" strokeWidth="1" />
      <rect
        x={x(s.q1)}
        y={2}
        width={Math.max(1, x(s.q3) - x(s.q1))}
        height={H - 4}
        fill="var(--t-shallows)"
        stroke="var(--t-channel)"
        strokeWidth="1"
      />
      <line x1={x(s.median)} x2={x(s.median)} y1={1} y2={H - 1} stroke="var(--t-ink)" strokeWidth="2" />
    </svg>
  );
}

/**
 * The box plot beside min · q1 · median · q3 · max, with the mean and sd. Quartiles from a sample
 * (`sampled`) read "≈" and say so on hover and to a screen reader.
 */
export function SummaryText({ s, sampled = false }: { s: Summary; sampled?: boolean }) {
  const m = (v: number) => formatNumber(v, "measure");
  const q = (v: number) => (sampled ? `≈${m(v)}` : m(v));
  const from = sampled ? `, ${SAMPLED_QUARTILES}` : "";
  return (
    <span className="flex flex-wrap items-center gap-2 text-xs tabular-nums">
      <BoxPlot s={s} sampled={sampled} />
      <span>
        {m(s.min)} · <span title={`lower quartile${from}`}>{q(s.q1)}</span> ·{" "}
        <strong title={`median${from}`}>{q(s.median)}</strong> ·{" "}
        <span title={`upper quartile${from}`}>{q(s.q3)}</span> · {m(s.max)}
        <span className="text-silt-ink">
          {" "}
          (mean {formatNumber(s.mean, "estimate")}, sd {formatNumber(s.sd, "estimate")})
        </span>
      </span>
    </span>
  );
}
