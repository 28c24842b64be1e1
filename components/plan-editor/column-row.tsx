"use client";

import { Badge } from "@/components/ui/badge";
import { Button } from "@/components/ui/button";
import { Field } from "@/components/ui/field";
import { Input } from "@/components/ui/input";
import { Select } from "@/components/ui/select";
import { COLUMN_TYPES, ROLES } from "@/lib/readiness";
import type { ColumnDraft } from "./form-state";
import { TokenList } from "./token-list";

const ROLE_HINT: Record<ColumnDraft["role"], string> = {
  response: "the outcome the model explains",
  predictor: "a term of the model",
  key: "identifies a row",
  carry: "kept, not modelled",
  ignore: "not read",
};

type Props = {
  column: ColumnDraft;
  index: number;
  count: number;
  errors: (field: string) => string[] | undefined;
  onChange: (patch: Partial<ColumnDraft>) => void;
  onMove: (dir: -1 | 1) => void;
  onRemove: () => void;
};

function Errors({ id, list }: { id: string; list: string[] | undefined }) {
  return (
    <p id={id} aria-live="polite" className="text-sm text-clay">
      {list?.join(" ") ?? ""}
    </p>
  );
}

type FieldProps = { id: string; label: string; errors: string[] | undefined };

/** A choice among a fixed list (role, type), printed as the values themselves. */
function ChoiceField<T extends string>(
  props: FieldProps & { value: T; options: readonly T[]; onPick: (value: T) => void },
) {
  return (
    <Field id={props.id} label={props.label} errors={props.errors} className="w-32">
      <Select
        value={props.value}
        onChange={(e) => props.onPick(e.target.value as T)}
        className="h-8 w-full text-sm"
      >
        {props.options.map((o) => (
          <option key={o} value={o}>
            {o}
          </option>
        ))}
      </Select>
    </Field>
  );
}

/** A numeric column's planned minimum or maximum (empty: no bound). */
function BoundField(props: FieldProps & { value: string; onValue: (value: string) => void }) {
  return (
    <Field id={props.id} label={props.label} errors={props.errors} className="w-28">
      <Input
        value={props.value}
        onChange={(e) => props.onValue(e.target.value)}
        inputMode="decimal"
        className="h-8 w-full text-sm tabular"
        placeholder="none"
      />
    </Field>
  );
}

/** One column of the plan: name, role, type, range, levels and baseline, missing tokens. */
export function ColumnRow({ column: c, index, count, errors, onChange, onMove, onRemove }: Props) {
  const id = (f: string) => `col-${c.key}-${f}`;
  const label = c.name.trim() || `column ${index + 1}`;
  const numeric = c.type === "number" || c.type === "integer";
  const rowErrors = errors("_row");
  const levelErrors = errors("levels");
  const tokenErrors = errors("missingTokens");
  return (
    <fieldset
      className="relative rounded border border-silt-line bg-white px-3 pb-2 pt-1"
      data-column-row={index}
    >
      <legend className="px-1 text-sm font-semibold">
        <span className="tabular text-silt-ink">{index + 1}.</span>{" "}
        <span className="font-mono">{c.name || "(unnamed)"}</span>
        <span className="ml-2 font-normal text-silt-ink">{ROLE_HINT[c.role]}</span>
      </legend>
      <div className="absolute right-2 top-1 flex items-center gap-1">
        <Button
          variant="quiet"
          size="sm"
          disabled={index === 0}
          onClick={() => onMove(-1)}
          aria-label={`Move ${label} up`}
        >
          ↑
        </Button>
        <Button
          variant="quiet"
          size="sm"
          disabled={index === count - 1}
          onClick={() => onMove(1)}
          aria-label={`Move ${label} down`}
        >
          ↓
        </Button>
        <Button variant="danger" size="sm" onClick={onRemove} aria-label={`Remove ${label}`}>
          Remove
        </Button>
      </div>
      <div className="flex flex-wrap items-start gap-x-3 gap-y-1 pr-44">
        <Field id={id("name")} label="Name" errors={errors("name")} className="w-56">
          <Input
            value={c.name}
            onChange={(e) => onChange({ name: e.target.value })}
            className="h-8 w-full font-mono text-sm"
            autoComplete="off"
          />
        </Field>
        <ChoiceField
          id={id("role")}
          label="Role"
          errors={errors("role")}
          value={c.role}
          options={ROLES}
          onPick={(role) => onChange({ role })}
        />
        <ChoiceField
          id={id("type")}
          label="Type"
          errors={errors("type")}
          value={c.type}
          options={COLUMN_TYPES}
          onPick={(type) => onChange({ type })}
        />
        {numeric ? (
          <>
            <BoundField
              id={id("min")}
              label="Minimum"
              errors={errors("min")}
              value={c.min}
              onValue={(min) => onChange({ min })}
            />
            <BoundField
              id={id("max")}
              label="Maximum"
              errors={errors("max")}
              value={c.max}
              onValue={(max) => onChange({ max })}
            />
          </>
        ) : null}
        {c.role !== "ignore" ? (
          <details className="pt-6 text-sm" open={!!tokenErrors || undefined}>
            <summary className="cursor-pointer text-channel">
              Missing tokens:{" "}
              {c.missingTokens.length ? (
                <span className="font-mono text-ink">
                  {c.missingTokens.map((t) => (t === "" ? "(empty)" : t)).join(", ")}
                </span>
              ) : (
                "file-wide only"
              )}
            </summary>
            <div className="mt-1 flex flex-col gap-1">
              <label htmlFor={id("missingTokens")} className="text-xs text-silt-ink">
                Tokens meaning “missing” in this column, besides the file-wide ones
              </label>
              <TokenList
                id={id("missingTokens")}
                noun="token"
                values={c.missingTokens}
                allowEmpty
                placeholder="e.g. -999 or n/a"
                invalid={!!tokenErrors}
                describedBy={id("missingTokens-error")}
                onChange={(missingTokens) => onChange({ missingTokens })}
              />
              <Errors id={id("missingTokens-error")} list={tokenErrors} />
            </div>
          </details>
        ) : null}
      </div>

      {c.type === "category" ? (
        <div className="mt-1 flex flex-wrap items-start gap-x-6 gap-y-2">
          <div className="flex min-w-64 flex-col gap-1">
            <label htmlFor={id("levels")} className="text-sm font-semibold">
              Allowed levels <span className="font-normal text-silt-ink">(in this order)</span>
            </label>
            <TokenList
              id={id("levels")}
              noun="level"
              values={c.levels}
              reorderable
              invalid={!!levelErrors}
              describedBy={id("levels-error")}
              tagOf={(v) =>
                (c.baseline || c.levels[0]) === v ? <Badge tone="channel">baseline</Badge> : null
              }
              onChange={(levels) =>
                onChange({ levels, baseline: c.baseline && !levels.includes(c.baseline) ? "" : c.baseline })
              }
            />
            <Errors id={id("levels-error")} list={levelErrors} />
          </div>
          <div className="flex flex-col gap-2">
            <Field
              id={id("baseline")}
              label="Baseline level"
              hint="The reference level of the indicator columns."
              errors={errors("baseline")}
              className="w-56"
            >
              <Select
                value={c.baseline}
                onChange={(e) => onChange({ baseline: e.target.value })}
                className="h-8 w-full text-sm"
              >
                <option value="">{c.levels[0] ? `first level (${c.levels[0]})` : "first level"}</option>
                {c.levels.map((l) => (
                  <option key={l} value={l}>
                    {l}
                  </option>
                ))}
              </Select>
            </Field>
            <label className="flex items-center gap-2 text-sm">
              <input
                type="checkbox"
                checked={c.openLevels}
                onChange={(e) => onChange({ openLevels: e.target.checked })}
                className="size-4 accent-channel"
              />
              Open list: other levels are allowed
            </label>
            <Errors id={id("openLevels-error")} list={errors("openLevels")} />
          </div>
        </div>
      ) : null}
      {rowErrors ? <Errors id={id("row-error")} list={rowErrors} /> : null}
    </fieldset>
  );
}
