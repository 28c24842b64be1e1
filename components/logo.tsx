import { useId } from "react";
import { cx } from "@/components/ui/cx";

/**
 * The Tributary mark: a broad main channel crosses the tile from left to right, and a
 * narrow tributary comes down from above and joins it, downstream, at the bend.
 */
export function LogoMark({ size = 28, className }: { size?: number; className?: string }) {
  const clip = `logo-clip-${useId().replace(/:/g, "")}`;
  return (
    <svg
      width={size}
      height={size}
      viewBox="0 0 32 32"
      role="img"
      aria-label="Tributary"
      className={className}
    >
      <defs>
        <clipPath id={clip}>
          <rect width="32" height="32" rx="7" />
        </clipPath>
      </defs>
      <rect width="32" height="32" rx="7" fill="#12262E" />
      <g clipPath={`url(#${clip})`} fill="none">
        <path d="M-1 10.5 C 8 10.5, 11 13.5, 15 18 S 23 25, 33 25" stroke="#D8ECEB" strokeWidth="4.6" />
        <path d="M11 -1 C 11.5 7, 14 12.5, 19 19.2" stroke="#5FB1B8" strokeWidth="2.4" />
      </g>
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
