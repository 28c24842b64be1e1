import type { ModelSize } from "@/lib/studies/model-size";

const KIND_LABEL: Record<ModelSize["terms"][number]["kind"], string> = {
  numeric: "numeric",
  boolean: "yes/no",
  category: "indicators (k − 1)",
  interaction: "interaction",
};

/**
 * The planned model's size: its terms with the columns each adds, p, and the complete cases
 * the df target needs (df headroom = n − p − 1, lib/readiness/CHECKS.md "The model: p, n and residual df"). Used live by the editor and on
 * the study page.
 */
export function ModelSummary({ size, compact = false }: { size: ModelSize; compact?: boolean }) {
  const numeric = size.terms
    .filter((t) => t.kind === "numeric" || t.kind === "boolean")
    .reduce((s, t) => s + t.df, 0);
  const indicators = size.terms.filter((t) => t.kind === "category").reduce((s, t) => s + t.df, 0);
  const interactions = size.terms.filter((t) => t.kind === "interaction").reduce((s, t) => s + t.df, 0);
  return (
    <div className="flex flex-col gap-3">
      <dl className="grid grid-cols-[1fr_auto] gap-x-4 gap-y-0.5 text-sm">
        <dt>Numeric and yes/no terms</dt>
        <dd className="num">{numeric}</dd>
        <dt>Indicator columns of categories</dt>
        <dd className="num">{indicators}</dd>
        <dt>Interaction columns</dt>
        <dd className="num">{interactions}</dd>
        <dt className="border-t border-silt-line pt-0.5 font-semibold">
          Model parameters <span className="italic">p</span>
        </dt>
        <dd className="num border-t border-silt-line pt-0.5 text-lg font-semibold" data-testid="model-p">
          {size.p}
        </dd>
        <dt>Intercept</dt>
        <dd className="num">{size.intercept ? "yes (+1)" : "no"}</dd>
        <dt>Residual df target</dt>
        <dd className="num">{size.dfTarget}</dd>
        <dt>Complete cases for the target</dt>
        <dd className="num font-semibold">{size.casesForTarget}</dd>
        <dt>Cases by the per-parameter rule</dt>
        <dd className="num">{size.casesPerParameterRule}</dd>
      </dl>
      {!compact && size.terms.length > 0 ? (
        <table className="w-full text-sm">
          <caption className="sr-only">Model terms</caption>
          <thead>
            <tr className="border-b border-silt text-left">
              <th className="py-1 pr-2 font-semibold">Term</th>
              <th className="py-1 pr-2 font-semibold">Kind</th>
              <th className="py-1 text-right font-semibold">Columns</th>
            </tr>
          </thead>
          <tbody>
            {size.terms.map((t, i) => (
              <tr key={`${t.term}-${i}`} className="border-b border-silt-line align-top">
                <td className="py-1 pr-2 font-mono text-xs" title={t.columns.join(", ")}>
                  {t.term}
                </td>
                <td className="py-1 pr-2 text-silt-ink">{KIND_LABEL[t.kind]}</td>
                <td className="num py-1">{t.df}</td>
              </tr>
            ))}
          </tbody>
        </table>
      ) : null}
      <p className="text-xs text-silt-ink">
        df headroom = complete cases − <span className="italic">p</span> − 1. Categories use treatment coding:
        k levels give k − 1 indicator columns against the baseline.
      </p>
    </div>
  );
}
