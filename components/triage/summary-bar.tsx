/**
 * The batch page's summary bar, which stays in view while the reviewer reads: the verdict, n, p
 * and residual df, the decision (or, once decided, the next batch in the queue), and an index of
 * the page's sections.
 */
import type { ReactNode } from "react";
import { SeverityBadge } from "@/components/severity-badge";
import { formatCount } from "@/lib/format";
import type { ReadinessReport } from "@/lib/readiness";

export type SectionLink = { id: string; title: string };

const TONE = {
  clay: "border-clay text-clay-ink",
  ochre: "border-ochre text-ochre-ink",
  reed: "border-reed text-reed-ink",
} as const;

export function SummaryBar({
  report,
  verdict,
  sections,
  controls,
}: {
  report: ReadinessReport | null;
  verdict: { tone: keyof typeof TONE; text: string } | null;
  sections: SectionLink[];
  controls?: ReactNode;
}) {
  return (
    <div
      className="sticky top-0 z-20 -mx-2 mb-6 border-b border-silt-line bg-sand/95 px-2 py-2 backdrop-blur"
      data-testid="summary-bar"
    >
      <div className="flex flex-wrap items-center gap-x-4 gap-y-2">
        {report && verdict ? (
          <div className={`flex flex-wrap items-center gap-3 border-l-4 pl-2 ${TONE[verdict.tone]}`}>
            <p className="font-semibold" data-testid="summary-verdict">
              {report.status === "unreadable" ? "File not readable" : verdict.text.split(":")[0]}
            </p>
            <SeverityBadge severity="blocker" count={report.counts.blocker} />
            <SeverityBadge severity="warning" count={report.counts.warning} />
            <SeverityBadge severity="note" count={report.counts.note} />
            <dl className="flex gap-3 text-sm tabular-nums text-ink">
              <div className="flex gap-1">
                <dt>n</dt>
                <dd className="font-semibold">{formatCount(report.rows.complete)}</dd>
              </div>
              <div className="flex gap-1">
                <dt>p</dt>
                <dd className="font-semibold">{formatCount(report.model.parameters)}</dd>
              </div>
              <div className="flex gap-1">
                <dt>residual df</dt>
                <dd className="font-semibold">{formatCount(report.model.residualDf)}</dd>
              </div>
            </dl>
          </div>
        ) : null}
        {controls ? <div className="ml-auto min-w-[min(100%,36rem)] flex-1">{controls}</div> : null}
      </div>
      {sections.length ? (
        <nav aria-label="Sections of this page" className="mt-1.5">
          <ul className="flex flex-wrap gap-x-3 gap-y-1 text-sm">
            {sections.map((s) => (
              <li key={s.id}>
                <a href={`#${s.id}-title`} className="text-channel underline-offset-2 hover:underline">
                  {s.title}
                </a>
              </li>
            ))}
          </ul>
        </nav>
      ) : null}
    </div>
  );
}
