"use client";

import { useEffect, useId, useRef } from "react";
import { toast } from "sonner";
import type { PlanInput } from "@/lib/readiness";
import { formatBytes } from "@/lib/format";
import { useDraft } from "@/lib/client/use-draft";

const MAX_SAMPLE_BYTES = 50 * 1024 * 1024;

/** Chooses a sample CSV, drafts a plan from it in the browser, and hands the plan to the form. */
export function DraftFromFile({
  hasColumns,
  onDraft,
}: {
  hasColumns: boolean;
  onDraft: (plan: PlanInput) => void;
}) {
  const id = useId();
  const input = useRef<HTMLInputElement>(null);
  const { state, run } = useDraft();
  const applied = useRef<unknown>(null);

  useEffect(() => {
    if (state.phase !== "done" || applied.current === state.result) return;
    applied.current = state.result;
    if (state.result.plan) {
      onDraft(state.result.plan);
      toast.success(
        `Drafted ${state.result.plan.columns.length} columns from ${state.fileName}. Check each before publishing.`,
      );
    }
  }, [state, onDraft]);

  function choose(file: File | undefined) {
    if (!file) return;
    if (file.size === 0) {
      toast.error(`${file.name} is empty (0 bytes); choose a file with a header row and some data rows.`);
      return;
    }
    if (file.size > MAX_SAMPLE_BYTES) {
      toast.error(
        `${file.name} is ${formatBytes(file.size)}; a sample of up to ${formatBytes(MAX_SAMPLE_BYTES)} is enough to draft a plan. Cut it to its first rows.`,
      );
      return;
    }
    if (
      hasColumns &&
      !window.confirm(
        "Replace the columns in the form with the ones drafted from this file? The model settings and thresholds stay.",
      )
    ) {
      if (input.current) input.current.value = "";
      return;
    }
    run(file);
  }

  return (
    <div className="flex flex-col gap-2">
      <div className="flex flex-wrap items-center gap-3">
        <label htmlFor={id} className="text-sm font-semibold">
          Sample file (CSV or TSV)
        </label>
        <input
          ref={input}
          id={id}
          type="file"
          accept=".csv,.tsv,.txt,text/csv,text/tab-separated-values,text/plain"
          onChange={(e) => choose(e.target.files?.[0])}
          className="text-sm file:mr-3 file:rounded file:border file:border-silt file:bg-white file:px-3 file:py-1 file:text-sm file:font-semibold file:text-ink hover:file:bg-sand-deep"
        />
      </div>
      <div aria-live="polite" className="text-sm">
        {state.phase === "running" ? (
          <p>
            Reading {state.fileName} ({formatBytes(state.size)})…
          </p>
        ) : null}
        {state.phase === "error" ? (
          <p className="text-clay">
            The sample {state.fileName} could not be read: {state.message}
          </p>
        ) : null}
        {state.phase === "done" && state.result.error ? (
          <p className="text-clay">
            {state.fileName} could not be read: {state.result.error.message} {state.result.error.fix}
          </p>
        ) : null}
        {state.phase === "done" && state.result.plan ? (
          <div className="rounded border border-slate/30 bg-slate-wash px-3 py-2">
            <p className="font-semibold text-slate-ink">
              <span aria-hidden="true">○ </span>Drafted from {state.fileName}: check these before publishing
            </p>
            <ul className="mt-1 list-disc pl-5">
              {state.result.notes.map((n) => (
                <li key={n}>{n}</li>
              ))}
            </ul>
          </div>
        ) : null}
      </div>
    </div>
  );
}
