import { forwardRef, type InputHTMLAttributes } from "react";
import { cx } from "./cx";

export const inputClass =
  "block h-9 w-full rounded border border-silt bg-white px-2.5 text-base text-ink placeholder:text-silt-ink " +
  "focus:border-channel focus:outline-2 focus:outline-offset-0 focus:outline-channel " +
  "aria-[invalid=true]:border-clay disabled:bg-sand-deep disabled:text-silt-ink";

export const Input = forwardRef<HTMLInputElement, InputHTMLAttributes<HTMLInputElement>>(function Input(
  { className, ...rest },
  ref,
) {
  return <input ref={ref} className={cx(inputClass, className)} {...rest} />;
});
