import { forwardRef, type SelectHTMLAttributes } from "react";
import { cx } from "./cx";
import { sized } from "./input";

export const Select = forwardRef<HTMLSelectElement, SelectHTMLAttributes<HTMLSelectElement>>(function Select(
  { className, children, ...rest },
  ref,
) {
  return (
    <select ref={ref} className={cx(sized(className), "pr-7")} {...rest}>
      {children}
    </select>
  );
});
