"use client";

import { Field } from "@/components/ui/field";
import { Input } from "@/components/ui/input";
import { DEFAULT_THRESHOLDS } from "@/lib/readiness";
import { THRESHOLD_KEYS, type PlanDraft, type ThresholdKey } from "./form-state";
import { THRESHOLD_LABELS } from "./threshold-labels";

/** Every threshold with its default as placeholder; an empty field keeps the default. */
export function ThresholdsFields({
  values,
  errors,
  onChange,
}: {
  values: PlanDraft["thresholds"];
  errors: Record<string, string[]>;
  onChange: (k: ThresholdKey, v: string) => void;
}) {
  return (
    <div className="grid grid-cols-1 gap-x-4 gap-y-1 sm:grid-cols-2 lg:grid-cols-3">
      {THRESHOLD_KEYS.map((k) => {
        const def = DEFAULT_THRESHOLDS[k];
        return (
          <Field key={k} id={`threshold-${k}`} label={THRESHOLD_LABELS[k]} errors={errors[`thresholds.${k}`]}>
            <Input
              value={values[k] ?? ""}
              onChange={(e) => onChange(k, e.target.value)}
              inputMode="decimal"
              placeholder={
                def === null ? `default: the df floor (${DEFAULT_THRESHOLDS.dfFloor})` : `default ${def}`
              }
              className="h-8 text-sm tabular"
              autoComplete="off"
            />
          </Field>
        );
      })}
    </div>
  );
}
