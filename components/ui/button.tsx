import { forwardRef, type ButtonHTMLAttributes } from "react";
import { cx } from "./cx";

type Variant = "primary" | "secondary" | "danger" | "quiet";
type Size = "sm" | "md";

const variants: Record<Variant, string> = {
  primary: "bg-channel text-white border-channel hover:bg-channel-deep hover:border-channel-deep",
  secondary: "bg-white text-ink border-silt hover:bg-sand-deep",
  danger: "bg-white text-clay border-clay hover:bg-clay-wash",
  quiet: "bg-transparent text-channel border-transparent hover:bg-channel-wash",
};
const sizes: Record<Size, string> = {
  sm: "h-7 px-2.5 text-sm",
  md: "h-9 px-3.5 text-base",
};

export type ButtonProps = ButtonHTMLAttributes<HTMLButtonElement> & {
  variant?: Variant;
  size?: Size;
  /** shows the label with a trailing ellipsis and disables the button while work runs */
  busy?: boolean;
};

/** The one button of the product; `busy` keeps the label (no spinner-only state). */
export const Button = forwardRef<HTMLButtonElement, ButtonProps>(function Button(
  { variant = "primary", size = "md", busy = false, className, children, disabled, type = "button", ...rest },
  ref,
) {
  return (
    <button
      ref={ref}
      type={type}
      disabled={disabled || busy}
      aria-busy={busy || undefined}
      className={cx(
        "inline-flex items-center justify-center gap-1.5 whitespace-nowrap rounded border font-semibold",
        "transition-colors disabled:cursor-not-allowed disabled:opacity-60",
        variants[variant],
        sizes[size],
        className,
      )}
      {...rest}
    >
      {children}
      {busy ? <span aria-hidden="true">…</span> : null}
    </button>
  );
});
