import type { ReactNode } from "react";

/** A titled block of a page (no card chrome: a heading, an optional note, the content). */
export function Section({
  title,
  note,
  actions,
  children,
  id,
}: {
  title: string;
  note?: ReactNode;
  actions?: ReactNode;
  children: ReactNode;
  id?: string;
}) {
  const headingId = id ? `${id}-title` : undefined;
  return (
    <section className="mb-8" aria-labelledby={headingId}>
      <div className="mb-2 flex flex-wrap items-baseline justify-between gap-2">
        <h2 id={headingId} className="text-lg font-semibold">
          {title}
        </h2>
        {actions}
      </div>
      {note ? <p className="-mt-1 mb-2 text-sm text-silt-ink">{note}</p> : null}
      {children}
    </section>
  );
}
