"use client";
/** The plan editor's model settings: intercept, interactions, anticipated R², outcome, selection. */
import { Field } from "@/components/ui/field";
import { Input } from "@/components/ui/input";
import type { PlanDraft } from "./form-state";
import { InteractionsField } from "./interactions-field";

type Props = {
  draft: PlanDraft;
  errors: Record<string, string[]>;
  /** the predictors named so far, for the interactions */
  predictors: string[];
  /** the model's parameters besides the intercept */
  parameters: number;
  update: (patch: Partial<PlanDraft>) => void;
};

export function ModelFields({ draft, errors, predictors, parameters, update }: Props) {
  return (
    <div className="flex flex-col gap-4">
      <label className="flex items-center gap-2 text-base">
        <input
          type="checkbox"
          checked={draft.intercept}
          onChange={(e) => update({ intercept: e.target.checked })}
          className="size-4 accent-channel"
        />
        The model has an intercept
      </label>
      <InteractionsField
        predictors={predictors}
        value={draft.interactions}
        errors={errors}
        onChange={(interactions) => update({ interactions })}
      />
      <div className="flex flex-wrap gap-4">
        <Field
          id="anticipatedR2"
          label="Anticipated R²"
          hint="Adjusted R² expected (Riley et al. 2019), between 0 and 1."
          errors={errors.anticipatedR2}
          className="w-56"
        >
          <Input
            value={draft.anticipatedR2}
            onChange={(e) => update({ anticipatedR2: e.target.value })}
            inputMode="decimal"
            className="h-8 text-sm tabular"
            placeholder="none"
          />
        </Field>
        <Field
          id="outcome-mean"
          label="Outcome mean"
          hint="The response's anticipated mean."
          errors={errors["outcome.mean"] ?? errors.outcome}
          className="w-44"
        >
          <Input
            value={draft.outcomeMean}
            onChange={(e) => update({ outcomeMean: e.target.value })}
            inputMode="decimal"
            className="h-8 text-sm tabular"
            placeholder="none"
          />
        </Field>
        <Field
          id="outcome-sd"
          label="Outcome SD"
          hint="Its anticipated standard deviation."
          errors={errors["outcome.sd"]}
          className="w-44"
        >
          <Input
            value={draft.outcomeSd}
            onChange={(e) => update({ outcomeSd: e.target.value })}
            inputMode="decimal"
            className="h-8 text-sm tabular"
            placeholder="none"
          />
        </Field>
      </div>
      <div className="flex flex-wrap items-start gap-4">
        <label className="flex items-center gap-2 pt-6 text-base">
          <input
            type="checkbox"
            checked={draft.selectionPlanned}
            onChange={(e) => update({ selectionPlanned: e.target.checked })}
            className="size-4 accent-channel"
          />
          Variable selection is planned
        </label>
        {draft.selectionPlanned ? (
          <Field
            id="selection-candidates"
            label="Candidate parameters"
            hint={`All candidate columns before selection (this plan's model has ${parameters}).`}
            errors={errors["selection.candidates"] ?? errors.selection}
            className="w-56"
          >
            <Input
              value={draft.selectionCandidates}
              onChange={(e) => update({ selectionCandidates: e.target.value })}
              inputMode="numeric"
              className="h-8 text-sm tabular"
              placeholder={String(parameters)}
            />
          </Field>
        ) : null}
      </div>
    </div>
  );
}
