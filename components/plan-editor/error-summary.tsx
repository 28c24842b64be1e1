"use client";

import { useEffect, useRef } from "react";
import type { ColumnDraft } from "./form-state";

/** Where a problem is, in words: "column 4 (soil), baseline". */
function place(key: string, columns: readonly ColumnDraft[]): string {
  const m = /^col:([^.]+)\.(.+)$/.exec(key);
  if (m) {
    const i = columns.findIndex((c) => c.key === m[1]);
    const c = columns[i];
    const field =
      m[2] === "_row"
        ? ""
        : `, ${m[2] === "missingTokens" ? "missing tokens" : m[2] === "openLevels" ? "open list" : m[2]}`;
    return c ? `Column ${i + 1} (${c.name || "unnamed"})${field}` : "A removed column";
  }
  if (key === "_form") return "The plan";
  if (key === "columns") return "Columns";
  return key.replace(/\./g, " › ");
}

/** Every problem of the last publish attempt in one list (each also shows next to its field). */
export function ErrorSummary({
  message,
  errors,
  columns,
}: {
  message: string;
  errors: Record<string, string[]>;
  columns: readonly ColumnDraft[];
}) {
  const entries = Object.entries(errors);
  const box = useRef<HTMLDivElement>(null);
  // after a refused publish, bring the list into view (the button is at the foot of the form)
  useEffect(() => {
    if (box.current) {
      box.current.focus({ preventScroll: true });
      box.current.scrollIntoView({ block: "start", behavior: "smooth" });
    }
  }, [errors, message]);
  if (!message && entries.length === 0) return <div aria-live="assertive" />;
  return (
    <div
      ref={box}
      tabIndex={-1}
      role="alert"
      className="mb-6 scroll-mt-4 rounded border border-clay/40 bg-clay-wash px-4 py-3 outline-none"
    >
      <p className="font-semibold text-clay-ink">
        <span aria-hidden="true">■ </span>
        {message || "The plan was not published."}
      </p>
      {entries.length > 0 ? (
        <ul className="mt-1 list-disc pl-5 text-sm">
          {entries.map(([k, msgs]) => (
            <li key={k}>
              <span className="font-semibold">{place(k, columns)}:</span> {msgs.join(" ")}
            </li>
          ))}
        </ul>
      ) : null}
    </div>
  );
}
