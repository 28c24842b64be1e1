import type { ReactNode } from "react";
import { cx } from "./cx";

export type BadgeTone = "neutral" | "channel" | "reed" | "clay" | "ochre" | "slate";

const tones: Record<BadgeTone, string> = {
  neutral: "bg-sand-deep text-ink-soft border-silt-line",
  channel: "bg-channel-wash text-channel-deep border-shallows",
  reed: "bg-reed-wash text-reed-ink border-reed/30",
  clay: "bg-clay-wash text-clay-ink border-clay/30",
  ochre: "bg-ochre-wash text-ochre-ink border-ochre/30",
  slate: "bg-slate-wash text-slate-ink border-slate/30",
};

/** A small label. Colour is never the only signal: the text always says it. */
export function Badge({
  tone = "neutral",
  className,
  children,
}: {
  tone?: BadgeTone;
  className?: string;
  children: ReactNode;
}) {
  return (
    <span
      className={cx(
        "inline-flex items-center gap-1 whitespace-nowrap rounded-sm border px-1.5 py-px text-xs font-semibold",
        tones[tone],
        className,
      )}
    >
      {children}
    </span>
  );
}
