import type { ReactNode } from "react";
import { formatCount } from "@/lib/format";

export type KeyFigure = { label: string; value: number | null; hint?: ReactNode; id?: string };

/** A row of counts that matter most on a page, figures aligned, separated by hairlines. */
export function KeyFigures({ items }: { items: KeyFigure[] }) {
  return (
    <dl className="mb-8 grid grid-cols-2 overflow-hidden rounded border border-silt-line bg-white sm:grid-cols-4">
      {items.map((f) => (
        <div
          key={f.label}
          className="border-silt-line px-4 py-3 [&:not(:last-child)]:border-r"
          data-figure={f.id}
        >
          <dt className="text-xs font-semibold uppercase tracking-wider text-silt-ink">{f.label}</dt>
          <dd className="mt-1 text-2xl font-semibold tabular text-ink">{formatCount(f.value)}</dd>
          {f.hint ? <dd className="text-xs text-silt-ink">{f.hint}</dd> : null}
        </div>
      ))}
    </dl>
  );
}
