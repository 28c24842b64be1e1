import type { ReactNode } from "react";

/** A short plain caution at the foot of a report-like page (what the numbers do and do not say). */
export function PageFootnote({ children }: { children: ReactNode }) {
  return <footer className="mt-10 border-t border-silt-line pt-3 text-xs text-silt-ink">{children}</footer>;
}
