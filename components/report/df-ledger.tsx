/**
 * The df ledger: one bar for a batch or a pool — the complete cases split into
 * the intercept, the model's parameters (indicator columns shaded apart from numeric terms)
 * and the residual degrees of freedom, a tick at the plan's target, and the rows lost to
 * missing values drawn faded beyond the end.
 */
import { formatCount } from "@/lib/format";

export type LedgerInput = {
  total: number;
  complete: number;
  intercept: boolean;
  numericParameters: number;
  indicatorParameters: number;
  residualDf: number;
  target: number;
};

export function ledgerOf(
  report: {
    rows: { total: number; complete: number };
    model: {
      parameters: number;
      residualDf: number;
      dfTarget: number;
      terms: { term: string; columns: string[]; df: number }[];
    };
    fit?: { dfModel: number } | null;
  },
  intercept = true,
): LedgerInput {
  const indicator = report.model.terms.reduce(
    (s, t) => s + t.columns.filter((c) => c.includes("[")).length,
    0,
  );
  return {
    total: report.rows.total,
    complete: report.rows.complete,
    intercept,
    numericParameters: Math.max(0, report.model.parameters - indicator),
    indicatorParameters: indicator,
    residualDf: report.model.residualDf,
    target: report.model.dfTarget,
  };
}

export function DfLedger({ data, label }: { data: LedgerInput; label: string }) {
  const used = (data.intercept ? 1 : 0) + data.numericParameters + data.indicatorParameters;
  const residual = Math.max(0, data.residualDf);
  const lost = Math.max(0, data.total - data.complete);
  const targetEnd = used + data.target;
  const scale = Math.max(data.total, targetEnd, used, 1);
  const W = 640;
  const x = (v: number) => (v / scale) * W;
  const segs = [
    { key: "intercept", w: data.intercept ? 1 : 0, fill: "var(--t-ink)", label: "intercept" },
    { key: "numeric", w: data.numericParameters, fill: "var(--t-channel)", label: "numeric terms" },
    { key: "indicator", w: data.indicatorParameters, fill: "url(#ledger-hatch)", label: "indicator columns" },
    {
      key: "residual",
      w: Math.min(residual, Math.max(0, data.complete - used)),
      fill: data.residualDf >= data.target ? "var(--t-reed)" : "var(--t-ochre)",
      label: "residual df",
    },
  ];
  let at = 0;
  const headroom = data.residualDf - data.target;
  const summary = `${label}: ${formatCount(data.complete)} complete of ${formatCount(data.total)} rows; ${used} used by the intercept and ${data.numericParameters + data.indicatorParameters} parameters (${data.indicatorParameters} indicator columns); residual df ${formatCount(data.residualDf)} against a target of ${formatCount(data.target)} (${headroom >= 0 ? `${formatCount(headroom)} to spare` : `${formatCount(-headroom)} short`}).`;
  return (
    <figure className="grid grid-cols-1 gap-1" data-testid="df-ledger">
      <svg viewBox={`0 0 ${W} 34`} className="h-9 w-full max-w-[640px]" role="img" aria-label={summary}>
        <defs>
          <pattern
            id="ledger-hatch"
            width="5"
            height="5"
            patternUnits="userSpaceOnUse"
            patternTransform="rotate(45)"
          >
            <rect width="5" height="5" fill="var(--t-shallows)" />
            <line x1="0" y1="0" x2="0" y2="5" stroke="var(--t-channel)" strokeWidth="2" />
          </pattern>
        </defs>
        <rect x="0" y="6" width={W} height="20" fill="var(--t-sand-deep)" />
        {segs.map((s) => {
          const rect = (
            <rect key={s.key} x={x(at)} y="6" width={Math.max(0, x(s.w))} height="20" fill={s.fill}>
              <title>{`${s.label}: ${formatCount(s.w)}`}</title>
            </rect>
          );
          at += s.w;
          return rect;
        })}
        {lost > 0 ? (
          <rect x={x(data.complete)} y="6" width={x(lost)} height="20" fill="var(--t-silt)" opacity="0.25">
            <title>{`rows lost to missing values: ${formatCount(lost)}`}</title>
          </rect>
        ) : null}
        <line x1={x(targetEnd)} x2={x(targetEnd)} y1="1" y2="31" stroke="var(--t-ink)" strokeWidth="2" />
        <text x={Math.min(x(targetEnd) + 4, W - 60)} y="33" fontSize="8" fill="var(--t-ink)">
          target
        </text>
      </svg>
      <figcaption className="flex flex-wrap gap-x-4 gap-y-1 text-xs text-silt-ink tabular-nums">
        <span>
          <Swatch fill="var(--t-channel)" /> numeric terms {data.numericParameters}
        </span>
        <span>
          <Swatch hatch /> indicator columns {data.indicatorParameters}
        </span>
        <span>
          <Swatch fill={data.residualDf >= data.target ? "var(--t-reed)" : "var(--t-ochre)"} /> residual df{" "}
          {formatCount(data.residualDf)}
        </span>
        <span>┃ target {formatCount(data.target)}</span>
        {lost > 0 ? (
          <span>
            <Swatch fill="var(--t-silt)" faded /> lost to missing values {formatCount(lost)}
          </span>
        ) : null}
      </figcaption>
    </figure>
  );
}

function Swatch({ fill, hatch, faded }: { fill?: string; hatch?: boolean; faded?: boolean }) {
  return (
    <span
      aria-hidden="true"
      className="mr-1 inline-block h-2.5 w-2.5 align-[-1px]"
      style={
        hatch
          ? {
              background: "repeating-linear-gradient(45deg,var(--t-channel) 0 2px,var(--t-shallows) 2px 5px)",
            }
          : { background: fill, opacity: faded ? 0.35 : 1 }
      }
    />
  );
}
