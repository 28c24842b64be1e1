import { cloneElement, isValidElement, type ReactElement, type ReactNode } from "react";
import { cx } from "./cx";

type FieldProps = {
  /** id of the control inside; the label points at it */
  id: string;
  label: string;
  hint?: ReactNode;
  /** messages from the server's fieldErrors for this field */
  errors?: readonly string[] | string | null;
  className?: string;
  children: ReactElement<Record<string, unknown>>;
};

/**
 * Label + control + hint + error text. The error region is always rendered with
 * aria-live so screen readers announce messages that arrive after a submit.
 */
export function Field({ id, label, hint, errors, className, children }: FieldProps) {
  const list = errors == null ? [] : typeof errors === "string" ? [errors] : errors;
  const errorId = `${id}-error`;
  const hintId = `${id}-hint`;
  const describedBy =
    [hint ? hintId : null, list.length ? errorId : null].filter(Boolean).join(" ") || undefined;
  const control = isValidElement(children)
    ? cloneElement(children, {
        id,
        "aria-invalid": list.length ? true : undefined,
        "aria-describedby": describedBy,
      })
    : children;
  return (
    <div className={cx("flex flex-col gap-1", className)}>
      <label htmlFor={id} className="text-sm font-semibold text-ink">
        {label}
      </label>
      {control}
      {hint ? (
        <p id={hintId} className="text-xs text-silt-ink">
          {hint}
        </p>
      ) : null}
      <p id={errorId} aria-live="polite" className="text-sm text-clay">
        {list.join(" ")}
      </p>
    </div>
  );
}
