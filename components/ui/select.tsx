import { forwardRef, type SelectHTMLAttributes } from "react";
import { cx } from "./cx";
import { inputClass } from "./input";

export const Select = forwardRef<HTMLSelectElement, SelectHTMLAttributes<HTMLSelectElement>>(function Select(
  { className, children, ...rest },
  ref,
) {
  return (
    <select ref={ref} className={cx(inputClass, "pr-7", className)} {...rest}>
      {children}
    </select>
  );
});
