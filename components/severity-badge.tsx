import { cx } from "@/components/ui/cx";

export type Severity = "blocker" | "warning" | "note";

const meta: Record<Severity, { word: string; box: string }> = {
  blocker: { word: "Blocker", box: "bg-clay-wash text-clay-ink border-clay/40" },
  warning: { word: "Warning", box: "bg-ochre-wash text-ochre-ink border-ochre/40" },
  note: { word: "Note", box: "bg-slate-wash text-slate-ink border-slate/40" },
};

/** The shape of each severity, drawn (not a font glyph) so it looks the same everywhere. */
export function SeverityShape({ severity, className }: { severity: Severity; className?: string }) {
  const common = { width: 10, height: 10, viewBox: "0 0 10 10", "aria-hidden": true as const, className };
  if (severity === "blocker")
    return (
      <svg {...common}>
        <rect x="0.5" y="0.5" width="9" height="9" fill="var(--t-clay)" />
      </svg>
    );
  if (severity === "warning")
    return (
      <svg {...common}>
        <path d="M5 0.9 L9.1 5 L5 9.1 L0.9 5 Z" fill="none" stroke="var(--t-ochre)" strokeWidth="1.6" />
      </svg>
    );
  return (
    <svg {...common}>
      <circle cx="5" cy="5" r="3.4" fill="none" stroke="var(--t-slate)" strokeWidth="1.6" />
    </svg>
  );
}

/**
 * A severity told three ways: shape (■ ◇ ○), word and colour.
 * With `count` it reads "3 Blockers"; the word alone is what a screen reader hears.
 */
export function SeverityBadge({
  severity,
  count,
  className,
}: {
  severity: Severity;
  count?: number;
  className?: string;
}) {
  const { word, box } = meta[severity];
  const label = count === undefined ? word : `${count} ${count === 1 ? word : `${word}s`}`;
  return (
    <span
      className={cx(
        "inline-flex items-center gap-1.5 whitespace-nowrap rounded-sm border px-1.5 py-px text-xs font-semibold",
        // none of this severity: muted colours, not opacity, so the text keeps its contrast
        count === 0 ? "border-silt-line bg-sand-deep text-silt-ink" : box,
        className,
      )}
      data-severity={severity}
    >
      <SeverityShape severity={severity} />
      <span className="tabular">{label}</span>
    </span>
  );
}
