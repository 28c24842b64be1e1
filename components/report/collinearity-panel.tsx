/**
 * The collinearity of a design, as the batch page and the pool page show it: aliased terms, the
 * VIF / GVIF table, the condition indices (Belsley, Kuh & Welsch 1980) and the correlation picture
 * with its table alternative. At desktop width the two tables stand beside the picture.
 */
import { MatrixTable } from "@/components/ui";
import type { ReadinessReport, Thresholds } from "@/lib/readiness";
import { CollinearityTable } from "./report-tables";
import { ConditionIndices, CorrelationHeatmap } from "./report-pictures";

type CollinearityReport = NonNullable<ReadinessReport["collinearity"]>;

export function CollinearityPanel({
  coll,
  thresholds: t,
  csvName,
}: {
  coll: CollinearityReport;
  thresholds: Thresholds;
  csvName: string;
}) {
  return (
    <div className="grid grid-cols-1 gap-6">
      {coll.aliased.length > 0 ? (
        <ul className="text-sm">
          {coll.aliased.map((a) => (
            <li key={a.term} className="text-clay-ink">
              ■{" "}
              <span className="font-mono">
                {a.term} = {a.combination}
              </span>
            </li>
          ))}
        </ul>
      ) : null}
      {/* at desktop width the two tables stand beside the picture, not above and below it */}
      <div className="grid grid-cols-1 items-start gap-6 xl:grid-cols-[minmax(0,1fr)_auto]">
        <div className="grid min-w-0 grid-cols-1 gap-6">
          <CollinearityTable
            terms={coll.terms}
            vifWarning={t.vifWarning}
            vifStrong={t.vifStrong}
            csvName={csvName}
          />
          <div>
            <h3 className="mb-1 text-md font-semibold">Condition indices</h3>
            <p className="mb-2 text-xs text-silt-ink">
              Columns scaled to unit length, intercept included, not centred (Belsley, Kuh &amp; Welsch 1980).
              Flagged at η ≥ {t.conditionIndex} with two or more columns above {t.varianceProportion}.
            </p>
            <ConditionIndices
              indices={coll.conditionIndices}
              proportions={coll.varianceProportions}
              threshold={t.conditionIndex}
              share={t.varianceProportion}
            />
          </div>
        </div>
        <div className="min-w-0 xl:max-w-[44rem]">
          <CorrelationHeatmap columns={coll.correlations.columns} matrix={coll.correlations.matrix} />
          <MatrixTable
            caption="Correlations of the design columns"
            labels={coll.correlations.columns}
            matrix={coll.correlations.matrix}
          />
        </div>
      </div>
    </div>
  );
}
