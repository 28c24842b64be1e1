"use client";

import { useState } from "react";
import { Button } from "@/components/ui/button";
import { Select } from "@/components/ui/select";

type Props = {
  predictors: string[];
  value: [string, string][];
  errors: Record<string, string[]>;
  onChange: (next: [string, string][]) => void;
};

/** Two-way interactions between planned predictors: choose two, add; remove any. */
export function InteractionsField({ predictors, value, errors, onChange }: Props) {
  const [a, setA] = useState("");
  const [b, setB] = useState("");
  const [note, setNote] = useState("");
  const exists = (x: string, y: string) =>
    value.some(([p, q]) => (p === x && q === y) || (p === y && q === x));

  function add() {
    if (!a || !b) return setNote("Choose two predictors.");
    if (a === b) return setNote("An interaction needs two different predictors.");
    if (exists(a, b)) return setNote(`${a} × ${b} is already in the model.`);
    onChange([...value, [a, b]]);
    setNote(`Added ${a} × ${b}.`);
    setA("");
    setB("");
  }

  const pairErrors = (i: number) =>
    Object.entries(errors)
      .filter(([k]) => k === `interactions.${i}` || k.startsWith(`interactions.${i}.`))
      .flatMap(([, v]) => v);

  return (
    <fieldset className="flex flex-col gap-1.5">
      <legend className="text-sm font-semibold">Interactions</legend>
      {value.length === 0 ? (
        <p className="text-sm text-silt-ink">None: the model has main effects only.</p>
      ) : null}
      <ul className="flex flex-col gap-1">
        {value.map(([p, q], i) => {
          const errs = pairErrors(i);
          const stale = [p, q].filter((n) => !predictors.includes(n));
          return (
            <li key={`${p}:${q}:${i}`} className="flex flex-wrap items-center gap-2 text-sm">
              <span className="font-mono">
                {p} × {q}
              </span>
              <Button
                variant="quiet"
                size="sm"
                className="h-6 px-1.5 text-clay"
                onClick={() => onChange(value.filter((_, k) => k !== i))}
                aria-label={`Remove interaction ${p} × ${q}`}
              >
                ✕
              </Button>
              <span aria-live="polite" className="text-clay">
                {errs.join(" ") ||
                  (stale.length
                    ? `${stale.join(" and ")} ${stale.length === 1 ? "is" : "are"} no longer a predictor.`
                    : "")}
              </span>
            </li>
          );
        })}
      </ul>
      <div className="flex flex-wrap items-center gap-1.5">
        <PredictorPick id="interaction-a" which="first" value={a} predictors={predictors} onPick={setA} />
        <span aria-hidden="true">×</span>
        <PredictorPick id="interaction-b" which="second" value={b} predictors={predictors} onPick={setB} />
        <Button variant="secondary" size="sm" onClick={add} disabled={predictors.length < 2}>
          Add interaction
        </Button>
      </div>
      <p aria-live="polite" className="text-sm text-silt-ink">
        {predictors.length < 2 ? "An interaction needs at least two predictors in the plan." : note}
      </p>
    </fieldset>
  );
}

/** One side of a new interaction: a predictor of the plan, or none yet. */
function PredictorPick(props: {
  id: string;
  which: "first" | "second";
  value: string;
  predictors: string[];
  onPick: (name: string) => void;
}) {
  return (
    <>
      <label htmlFor={props.id} className="sr-only">
        {props.which === "first" ? "First" : "Second"} predictor
      </label>
      <Select
        id={props.id}
        value={props.value}
        onChange={(e) => props.onPick(e.target.value)}
        className="h-8 w-52 text-sm"
      >
        <option value="">{props.which} predictor</option>
        {props.predictors.map((p) => (
          <option key={p} value={p}>
            {p}
          </option>
        ))}
      </Select>
    </>
  );
}
