"use client";

import { useEffect, useRef, useState, type ReactNode } from "react";
import { Button } from "@/components/ui/button";
import { cx } from "@/components/ui/cx";
import { sized } from "@/components/ui/input";

type Props = {
  id: string;
  /** what one item is called, for button labels: "level", "token" */
  noun: string;
  values: string[];
  onChange: (next: string[]) => void;
  /** up/down buttons to set the order (levels are shown and coded in this order) */
  reorderable?: boolean;
  /** offers "empty cell" as an item (missing-value tokens) */
  allowEmpty?: boolean;
  /** a tag after an item, e.g. "baseline" */
  tagOf?: (value: string) => ReactNode;
  placeholder?: string;
  invalid?: boolean;
  describedBy?: string;
};

const shown = (v: string) =>
  v === "" ? <em className="text-silt-ink">empty cell</em> : <span className="font-mono">{v}</span>;
const spoken = (v: string) => (v === "" ? "empty cell" : v);

/**
 * An editable list of short strings: add, remove and (optionally) reorder with buttons, so the
 * order can be set from the keyboard; focus follows a moved item.
 */
export function TokenList({
  id,
  noun,
  values,
  onChange,
  reorderable,
  allowEmpty,
  tagOf,
  placeholder,
  invalid,
  describedBy,
}: Props) {
  const [text, setText] = useState("");
  const [note, setNote] = useState("");
  const focusAfter = useRef<{ index: number; dir: "up" | "down" } | null>(null);
  const listRef = useRef<HTMLOListElement>(null);

  useEffect(() => {
    const f = focusAfter.current;
    if (!f || !listRef.current) return;
    focusAfter.current = null;
    const item = listRef.current.children[f.index];
    const btn =
      item?.querySelector<HTMLButtonElement>(`button[data-dir="${f.dir}"]:not(:disabled)`) ??
      item?.querySelector<HTMLButtonElement>("button:not(:disabled)");
    btn?.focus();
  }, [values]);

  function add(value: string) {
    const v = value === "" ? "" : value.trim();
    if (v === "" && value !== "") return;
    if (values.includes(v)) {
      setNote(`“${spoken(v)}” is already in the list.`);
      return;
    }
    onChange([...values, v]);
    setText("");
    setNote(`Added ${noun} ${spoken(v)}.`);
  }

  function move(i: number, dir: "up" | "down") {
    const j = dir === "up" ? i - 1 : i + 1;
    if (j < 0 || j >= values.length) return;
    const next = [...values];
    [next[i], next[j]] = [next[j]!, next[i]!];
    focusAfter.current = { index: j, dir };
    onChange(next);
    setNote(`Moved ${spoken(values[i]!)} to position ${j + 1} of ${values.length}.`);
  }

  function remove(i: number) {
    const v = values[i]!;
    onChange(values.filter((_, k) => k !== i));
    setNote(`Removed ${noun} ${spoken(v)}.`);
  }

  return (
    <div className="flex flex-col gap-1.5">
      {values.length > 0 ? (
        <ol ref={listRef} className="flex max-w-sm flex-col gap-1" aria-label={`${noun}s`}>
          {values.map((v, i) => (
            <li
              key={`${v}\u0000${i}`}
              className="flex items-center gap-1.5 rounded border border-silt-line bg-white px-2 py-0.5 text-sm"
            >
              {reorderable ? (
                <span className="w-5 text-right text-xs text-silt-ink tabular">{i + 1}.</span>
              ) : null}
              <span className="min-w-0 flex-1 truncate">{shown(v)}</span>
              {tagOf?.(v)}
              {reorderable ? (
                <>
                  <Button
                    variant="quiet"
                    size="sm"
                    className="h-6 px-1.5"
                    data-dir="up"
                    disabled={i === 0}
                    onClick={() => move(i, "up")}
                    aria-label={`Move ${noun} ${spoken(v)} up`}
                  >
                    ↑
                  </Button>
                  <Button
                    variant="quiet"
                    size="sm"
                    className="h-6 px-1.5"
                    data-dir="down"
                    disabled={i === values.length - 1}
                    onClick={() => move(i, "down")}
                    aria-label={`Move ${noun} ${spoken(v)} down`}
                  >
                    ↓
                  </Button>
                </>
              ) : null}
              <Button
                variant="quiet"
                size="sm"
                className="h-6 px-1.5 text-clay"
                onClick={() => remove(i)}
                aria-label={`Remove ${noun} ${spoken(v)}`}
              >
                ✕
              </Button>
            </li>
          ))}
        </ol>
      ) : null}
      <div className="flex items-center gap-1.5">
        <input
          id={id}
          value={text}
          onChange={(e) => setText(e.target.value)}
          onKeyDown={(e) => {
            if (e.key === "Enter") {
              e.preventDefault();
              add(text);
            }
          }}
          placeholder={placeholder ?? `Add a ${noun}`}
          aria-invalid={invalid || undefined}
          aria-describedby={describedBy}
          className={cx(sized("h-8 w-44 text-sm"))}
        />
        <Button variant="secondary" size="sm" onClick={() => add(text)} disabled={text.trim() === ""}>
          Add
        </Button>
        {allowEmpty && !values.includes("") ? (
          <Button variant="quiet" size="sm" onClick={() => add("")}>
            Add empty cell
          </Button>
        ) : null}
      </div>
      <p className="sr-only" aria-live="polite">
        {note}
      </p>
    </div>
  );
}
