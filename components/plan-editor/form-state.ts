/**
 * The plan editor's form state and its conversion to and from the engine's plan input.
 * Numbers are kept as the text typed, so a half-typed value is never lost; converting
 * back reports what is not a number, by the plan path the server would use.
 */
import {
  DEFAULT_THRESHOLDS,
  type ColumnType,
  type PlanColumn,
  type PlanInput,
  type Role,
} from "@/lib/readiness";

export type ThresholdKey = keyof typeof DEFAULT_THRESHOLDS;
export const THRESHOLD_KEYS = Object.keys(DEFAULT_THRESHOLDS) as ThresholdKey[];

export type ColumnDraft = {
  /** stable React key; never sent */
  key: string;
  name: string;
  role: Role;
  type: ColumnType;
  levels: string[];
  baseline: string;
  openLevels: boolean;
  min: string;
  max: string;
  missingTokens: string[];
  /** fields the form does not edit (description, sentinels, date format) are kept as they were */
  rest: Pick<PlanColumn, "description" | "sentinels" | "dateFormat">;
};

export type PlanDraft = {
  columns: ColumnDraft[];
  intercept: boolean;
  interactions: [string, string][];
  missingTokens: string[];
  thresholds: Partial<Record<ThresholdKey, string>>;
  anticipatedR2: string;
  outcomeMean: string;
  outcomeSd: string;
  selectionPlanned: boolean;
  /** a count of candidate parameters, or candidate term names separated by commas */
  selectionCandidates: string;
  /** terms forced into every model of the selection, kept as the plan has them (null: none listed) */
  selectionRequired: string[] | null;
};

let counter = 0;
export const newKey = () => `c${++counter}-${Math.random().toString(36).slice(2, 7)}`;

const numText = (n: number | null | undefined) => (n === undefined || n === null ? "" : String(n));

export function emptyColumn(): ColumnDraft {
  return {
    key: newKey(),
    name: "",
    role: "predictor",
    type: "number",
    levels: [],
    baseline: "",
    openLevels: false,
    min: "",
    max: "",
    missingTokens: [],
    rest: {},
  };
}

/** Form state from a stored or drafted plan; `keyPrefix` must differ between plans loaded into one form. */
export function draftFromPlan(input: PlanInput | null | undefined, keyPrefix = "p"): PlanDraft {
  const p = input ?? ({ columns: [] } as unknown as PlanInput);
  const thresholds: PlanDraft["thresholds"] = {};
  for (const k of THRESHOLD_KEYS) {
    const v = (p.thresholds as Record<string, number | null | undefined> | undefined)?.[k];
    if (v !== undefined && v !== null) thresholds[k] = String(v);
  }
  return {
    // keys from positions: the server render and the browser's first render must agree
    columns: (p.columns ?? []).map((c, i) => ({
      key: `${keyPrefix}${i}`,
      name: c.name ?? "",
      role: c.role ?? "predictor",
      type: c.type ?? "text",
      levels: [...(c.levels ?? [])],
      baseline: c.baseline ?? "",
      openLevels: c.openLevels === true,
      min: numText(c.min),
      max: numText(c.max),
      missingTokens: [...(c.missingTokens ?? [])],
      rest: {
        ...(c.description !== undefined ? { description: c.description } : {}),
        ...(c.sentinels !== undefined ? { sentinels: c.sentinels } : {}),
        ...(c.dateFormat !== undefined ? { dateFormat: c.dateFormat } : {}),
      },
    })),
    intercept: p.intercept ?? true,
    interactions: (p.interactions ?? []).map(([a, b]) => [a, b] as [string, string]),
    missingTokens: [...(p.missingTokens ?? ["", "NA"])],
    thresholds,
    anticipatedR2: numText(p.anticipatedR2),
    outcomeMean: numText(p.outcome?.mean),
    outcomeSd: numText(p.outcome?.sd),
    selectionPlanned: p.selection !== undefined,
    selectionCandidates: Array.isArray(p.selection?.candidates)
      ? p.selection.candidates.join(", ")
      : numText(p.selection?.candidates),
    selectionRequired: p.selection?.required ? [...p.selection.required] : null,
  };
}

function num(
  text: string,
  path: string,
  errors: Record<string, string[]>,
  label: string,
): number | undefined {
  const t = text.trim().replace(/\s/g, "");
  if (t === "") return undefined;
  const n = Number(t);
  if (!Number.isFinite(n)) {
    (errors[path] ??= []).push(
      `${label} must be a number (with a decimal point), e.g. 0.25; “${text}” is not.`,
    );
    return undefined;
  }
  return n;
}

/**
 * The plan input for the server, and the fields that are not numbers. Categories keep their
 * levels and baseline; other types drop them (the schema refuses levels on a number).
 */
export function planFromDraft(d: PlanDraft): { plan: PlanInput; errors: Record<string, string[]> } {
  const errors: Record<string, string[]> = {};
  const columns: PlanColumn[] = d.columns.map((c, i) => {
    const col: PlanColumn = { name: c.name.trim(), role: c.role, type: c.type, ...c.rest };
    if (c.type === "category") {
      if (c.levels.length > 0) col.levels = c.levels;
      if (c.baseline) col.baseline = c.baseline;
      if (c.openLevels) col.openLevels = true;
    }
    if (c.type === "number" || c.type === "integer") {
      const min = num(c.min, `columns.${i}.min`, errors, "The minimum");
      const max = num(c.max, `columns.${i}.max`, errors, "The maximum");
      if (min !== undefined) col.min = min;
      if (max !== undefined) col.max = max;
    } else {
      delete col.sentinels;
    }
    if (c.type !== "date") delete col.dateFormat;
    if (c.missingTokens.length > 0) col.missingTokens = c.missingTokens;
    return col;
  });
  const thresholds: Record<string, number> = {};
  for (const k of THRESHOLD_KEYS) {
    const v = num(d.thresholds[k] ?? "", `thresholds.${k}`, errors, "This threshold");
    if (v !== undefined) thresholds[k] = v;
  }
  const plan: PlanInput = {
    columns,
    intercept: d.intercept,
    interactions: d.interactions,
    missingTokens: d.missingTokens,
    thresholds,
  };
  const r2 = num(d.anticipatedR2, "anticipatedR2", errors, "The anticipated R²");
  if (r2 !== undefined) plan.anticipatedR2 = r2;
  const mean = num(d.outcomeMean, "outcome.mean", errors, "The outcome mean");
  const sd = num(d.outcomeSd, "outcome.sd", errors, "The outcome SD");
  if (mean !== undefined || sd !== undefined) {
    if (mean === undefined)
      (errors["outcome.mean"] ??= []).push("Give the outcome's anticipated mean too, or clear the SD.");
    else if (sd === undefined)
      (errors["outcome.sd"] ??= []).push("Give the outcome's anticipated SD too, or clear the mean.");
    else plan.outcome = { mean, sd };
  }
  if (d.selectionPlanned) {
    const text = d.selectionCandidates.trim();
    const names = text
      .split(",")
      .map((t) => t.trim())
      .filter((t) => t !== "");
    const required = d.selectionRequired ? { required: d.selectionRequired } : {};
    if (text !== "" && !/^[\d\s.,]+$/.test(text)) plan.selection = { candidates: names, ...required };
    else {
      const n = num(text, "selection.candidates", errors, "The candidate count");
      if (n === undefined && !errors["selection.candidates"])
        (errors["selection.candidates"] ??= []).push(
          "Give the candidate terms by name (separated by commas), or the number of candidate parameters the selection starts from.",
        );
      else if (n !== undefined) plan.selection = { candidates: n, ...required };
    }
  }
  return { plan, errors };
}

/**
 * Re-keys errors from plan paths (`columns.3.baseline`) to the rows' stable keys
 * (`col:<key>.baseline`), so they stay beside their row when rows move. A path deeper than
 * the field (`columns.3.levels.2`) goes to the field; everything else keeps its path.
 */
export function errorsByRow(
  errors: Record<string, string[]>,
  columns: readonly ColumnDraft[],
): Record<string, string[]> {
  const out: Record<string, string[]> = {};
  for (const [path, messages] of Object.entries(errors)) {
    const m = /^columns\.(\d+)(?:\.([A-Za-z]+))?/.exec(path);
    const row = m ? columns[Number(m[1])] : undefined;
    const key = m && row ? `col:${row.key}.${m[2] ?? "_row"}` : path;
    (out[key] ??= []).push(...messages);
  }
  return out;
}
