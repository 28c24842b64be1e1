"use client";

import { useMemo, useState, useTransition } from "react";
import { useRouter } from "next/navigation";
import { toast } from "sonner";
import { Button } from "@/components/ui/button";
import { Field } from "@/components/ui/field";
import { Input } from "@/components/ui/input";
import { Section } from "@/components/ui/section";
import type { PlanInput } from "@/lib/readiness";
import type { Result } from "@/lib/result";
import { modelSize } from "@/lib/studies/model-size";
import { ColumnRow } from "./column-row";
import { DraftFromFile } from "./draft-from-file";
import {
  draftFromPlan,
  emptyColumn,
  errorsByRow,
  planFromDraft,
  type ColumnDraft,
  type PlanDraft,
} from "./form-state";
import { ModelFields } from "./model-fields";
import { ModelSummary } from "./model-summary";
import { ThresholdsFields } from "./thresholds-fields";
import { TokenList } from "./token-list";
import { ErrorSummary } from "./error-summary";

export type PublishPlan = (plan: PlanInput, note: string) => Promise<Result<{ version: number }>>;

type Props = {
  studySlug: string;
  initialPlan: PlanInput | null;
  currentVersion: number | null;
  nextVersion: number;
  publish: PublishPlan;
};

/**
 * The data-plan editor: columns with role, type, levels, baseline, range and missing tokens;
 * the model (intercept, interactions, anticipated R², outcome, selection); thresholds. The
 * model's p is recomputed on every change; the server validates with the engine's schema and
 * its messages appear next to their fields.
 */
export function PlanEditor({ studySlug, initialPlan, currentVersion, nextVersion, publish }: Props) {
  const router = useRouter();
  const [draft, setDraft] = useState<PlanDraft>(() => draftFromPlan(initialPlan));
  const [errors, setErrors] = useState<Record<string, string[]>>({});
  const [message, setMessage] = useState("");
  const [note, setNote] = useState("");
  const [pending, startTransition] = useTransition();

  const size = useMemo(() => modelSize(planFromDraft(draft).plan), [draft]);
  const predictors = [
    ...new Set(
      draft.columns.filter((c) => c.role === "predictor" && c.name.trim()).map((c) => c.name.trim()),
    ),
  ];

  const update = (patch: Partial<PlanDraft>) => setDraft((d) => ({ ...d, ...patch }));
  const updateColumn = (key: string, patch: Partial<ColumnDraft>) =>
    setDraft((d) => ({ ...d, columns: d.columns.map((c) => (c.key === key ? { ...c, ...patch } : c)) }));
  const moveColumn = (i: number, dir: -1 | 1) =>
    setDraft((d) => {
      const cols = [...d.columns];
      const j = i + dir;
      if (j < 0 || j >= cols.length) return d;
      [cols[i], cols[j]] = [cols[j]!, cols[i]!];
      return { ...d, columns: cols };
    });
  const removeColumn = (key: string) =>
    setDraft((d) => ({ ...d, columns: d.columns.filter((c) => c.key !== key) }));

  function submit() {
    const { plan, errors: local } = planFromDraft(draft);
    if (Object.keys(local).length > 0) {
      setErrors(errorsByRow(local, draft.columns));
      setMessage("Some values are not numbers; each is marked next to its field.");
      return;
    }
    const columnsAtSubmit = draft.columns;
    startTransition(async () => {
      const r = await publish(plan, note);
      if (r.ok) {
        setErrors({});
        setMessage("");
        toast.success(`Data plan version ${r.data.version} is published and current.`);
        router.push(`/studies/${studySlug}`);
        router.refresh();
        return;
      }
      setErrors(errorsByRow(r.fieldErrors ?? {}, columnsAtSubmit));
      setMessage(r.message);
      if (!r.fieldErrors) toast.error(r.message);
    });
  }

  const colErrors = (key: string) => (field: string) => errors[`col:${key}.${field}`];

  return (
    <div className="grid grid-cols-1 gap-8 xl:grid-cols-[minmax(0,1fr)_20rem]">
      <div className="min-w-0">
        <Section
          id="draft"
          title="Draft from a sample file"
          note="Reads a CSV in your browser (nothing is uploaded) and fills the form with its columns, types, levels and ranges for you to correct."
        >
          <DraftFromFile
            hasColumns={draft.columns.length > 0}
            onDraft={(plan) => {
              const next = draftFromPlan(plan, `d${Date.now()}-`);
              // keep the model settings and thresholds already set; take the drafted columns
              setDraft((d) => ({ ...d, columns: next.columns, interactions: [] }));
              setErrors({});
              setMessage("");
            }}
          />
        </Section>

        <ErrorSummary message={message} errors={errors} columns={draft.columns} />

        <Section
          id="columns"
          title={`Columns (${draft.columns.length})`}
          note="Every column the batches carry, in any order. Exactly one response; predictors make the model's terms."
        >
          <p id="columns-error" aria-live="polite" className="mb-1 text-sm text-clay">
            {errors.columns?.join(" ") ?? ""}
          </p>
          <div className="flex flex-col gap-2">
            {draft.columns.map((c, i) => (
              <ColumnRow
                key={c.key}
                column={c}
                index={i}
                count={draft.columns.length}
                errors={colErrors(c.key)}
                onChange={(patch) => updateColumn(c.key, patch)}
                onMove={(dir) => moveColumn(i, dir)}
                onRemove={() => removeColumn(c.key)}
              />
            ))}
          </div>
          <Button
            variant="secondary"
            size="sm"
            className="mt-2"
            onClick={() => update({ columns: [...draft.columns, emptyColumn()] })}
          >
            Add a column
          </Button>
        </Section>

        <Section id="model" title="The model">
          <ModelFields
            draft={draft}
            errors={errors}
            predictors={predictors}
            parameters={size.p}
            update={update}
          />
        </Section>

        <Section
          id="missing"
          title="Missing-value tokens for the whole file"
          note="Cells equal to one of these count as missing in every column."
        >
          <TokenList
            id="missing-tokens"
            noun="token"
            values={draft.missingTokens}
            allowEmpty
            onChange={(missingTokens) => update({ missingTokens })}
            placeholder="e.g. NA"
          />
          <p aria-live="polite" className="mt-1 text-sm text-clay">
            {Object.entries(errors)
              .filter(([k]) => k === "missingTokens" || k.startsWith("missingTokens."))
              .flatMap(([, v]) => v)
              .join(" ")}
          </p>
        </Section>

        <Section
          id="thresholds"
          title="Thresholds of the checks"
          note="Leave a field empty to use the default shown in it."
        >
          <ThresholdsFields
            values={draft.thresholds}
            errors={errors}
            onChange={(k, v) => update({ thresholds: { ...draft.thresholds, [k]: v } })}
          />
        </Section>

        <Section id="publish" title="Publish">
          <div className="flex flex-wrap items-end gap-3">
            <Field
              id="plan-note"
              label="Note (optional)"
              hint="What changed and why; shown in the plan's version history."
              errors={errors.note}
              className="w-[28rem] max-w-full"
            >
              <Input value={note} onChange={(e) => setNote(e.target.value)} maxLength={500} className="h-9" />
            </Field>
            <Button onClick={submit} busy={pending} className="mb-6">
              Publish as version {nextVersion}
            </Button>
          </div>
          <p className="text-sm text-silt-ink">
            {currentVersion == null
              ? "This study has no data plan yet; version 1 becomes current when published."
              : `Batches already checked keep version ${currentVersion}; new batches are checked against version ${nextVersion}.`}
          </p>
        </Section>
      </div>

      <aside className="xl:sticky xl:top-4 xl:self-start" aria-labelledby="model-size-title">
        <div className="rounded border border-silt-line bg-white px-4 py-3">
          <h2 id="model-size-title" className="mb-2 text-lg font-semibold">
            Model size
          </h2>
          <ModelSummary size={size} />
        </div>
      </aside>
    </div>
  );
}
