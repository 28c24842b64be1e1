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

/** The model's numbers: which draft field, and which server field errors show under it. */
const NUMBER_FIELDS = [
  {
    id: "anticipatedR2",
    key: "anticipatedR2",
    label: "Anticipated R²",
    hint: "Adjusted R² expected (Riley et al. 2019), between 0 and 1.",
    errors: ["anticipatedR2"],
    width: "w-56",
  },
  {
    id: "outcome-mean",
    key: "outcomeMean",
    label: "Outcome mean",
    hint: "The response's anticipated mean.",
    errors: ["outcome.mean", "outcome"],
    width: "w-44",
  },
  {
    id: "outcome-sd",
    key: "outcomeSd",
    label: "Outcome SD",
    hint: "Its anticipated standard deviation.",
    errors: ["outcome.sd"],
    width: "w-44",
  },
] as const;

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
        {NUMBER_FIELDS.map((f) => (
          <Field
            key={f.id}
            id={f.id}
            label={f.label}
            hint={f.hint}
            errors={f.errors.map((k) => errors[k]).find(Boolean)}
            className={f.width}
          >
            <Input
              value={draft[f.key]}
              onChange={(e) => update({ [f.key]: e.target.value })}
              inputMode="decimal"
              className="h-8 text-sm tabular"
              placeholder="none"
            />
          </Field>
        ))}
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
