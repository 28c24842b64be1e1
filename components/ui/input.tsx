import { forwardRef, type InputHTMLAttributes } from "react";
import { cx } from "./cx";

/** Base look of text inputs and selects; height and width come from `sized` unless the caller sets them. */
export const inputClass =
  "block rounded border border-silt bg-white px-2.5 text-base text-ink placeholder:text-silt-ink " +
  "focus:border-channel focus:outline-2 focus:outline-offset-0 focus:outline-channel " +
  "aria-[invalid=true]:border-clay disabled:bg-sand-deep disabled:text-silt-ink";

/** Adds the default height (h-9) and width (w-full) unless `className` sets its own. */
export function sized(className?: string): string {
  const c = className ?? "";
  return cx(inputClass, /(^|\s)h-/.test(c) ? "" : "h-9", /(^|\s)w-/.test(c) ? "" : "w-full", c);
}

export const Input = forwardRef<HTMLInputElement, InputHTMLAttributes<HTMLInputElement>>(function Input(
  { className, ...rest },
  ref,
) {
  return <input ref={ref} className={sized(className)} {...rest} />;
});
