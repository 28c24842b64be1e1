import { cx } from "@/components/ui/cx";

/**
 * The Tributary mark: a narrow stream bends in from the upper right and joins a broad
 * main channel that runs from the top left to the foot of the tile.
 */
export function LogoMark({ size = 28, className }: { size?: number; className?: string }) {
  return (
    <svg width={size} height={size} viewBox="0 0 32 32" role="img" aria-label="Tributary" className={className}>
      <rect width="32" height="32" rx="7" fill="#12262E" />
      {/* main channel */}
      <path d="M5 4.5 C 9 10, 15 12.5, 16.5 19 S 17.5 26.5, 19 29" fill="none" stroke="#D8ECEB" strokeWidth="4.2" strokeLinecap="round" />
      {/* tributary, meeting the channel at the bend */}
      <path d="M27.5 6 C 24 9.5, 20 11, 17.6 16" fill="none" stroke="#5FB1B8" strokeWidth="2.2" strokeLinecap="round" />
    </svg>
  );
}

/** Mark + name, for the top bar and the sign-in page. */
export function Logo({ className, size = 28 }: { className?: string; size?: number }) {
  return (
    <span className={cx("inline-flex items-center gap-2", className)}>
      <LogoMark size={size} />
      <span className="text-lg font-semibold tracking-tight text-ink">Tributary</span>
    </span>
  );
}
