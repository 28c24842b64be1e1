/**
 * The data plan: what a study expects of every batch, and the model the batches feed.
 * One zod schema, shared by the engine, the plan editor, the API and the CLI.
 */
import { z } from "zod";
import { DEFAULT_THRESHOLDS, thresholdsSchema, type Thresholds } from "./thresholds";

export { DEFAULT_THRESHOLDS, type Thresholds };

export const ROLES = ["response", "predictor", "key", "carry", "ignore"] as const;
export const COLUMN_TYPES = ["number", "integer", "category", "date", "boolean", "text"] as const;
export type Role = (typeof ROLES)[number];
export type ColumnType = (typeof COLUMN_TYPES)[number];

const name = z.string().trim().min(1, "a column name cannot be blank").max(200);

export const planColumnSchema = z.object({
  name,
  role: z.enum(ROLES),
  type: z.enum(COLUMN_TYPES),
  /** allowed levels of a category, in display order */
  levels: z.array(z.string().min(1)).optional(),
  /** baseline level of a category (treatment coding); default: the first level */
  baseline: z.string().min(1).optional(),
  /** levels outside `levels` are allowed (open list) */
  openLevels: z.boolean().optional(),
  min: z.number().finite().optional(),
  max: z.number().finite().optional(),
  /** tokens that mean "missing" in this column, on top of the plan's file-wide tokens */
  missingTokens: z.array(z.string()).optional(),
  /** a sentinel declared by the provider, e.g. -999 */
  sentinels: z.array(z.number()).optional(),
  /** date format hint; ISO 8601 when absent */
  dateFormat: z.enum(["iso", "dmy", "mdy"]).optional(),
  description: z.string().max(2000).optional(),
});
export type PlanColumn = z.infer<typeof planColumnSchema>;

export const planSchema = z
  .object({
    columns: z.array(planColumnSchema).min(1, "a plan needs at least one column"),
    intercept: z.boolean().default(true),
    /** two-way interactions between planned predictors */
    interactions: z.array(z.tuple([name, name])).default([]),
    /** file-wide missing-value tokens */
    missingTokens: z.array(z.string()).default(["", "NA"]),
    /** anticipated adjusted R² (Riley et al. 2019 criteria) */
    anticipatedR2: z.number().gt(0).lt(1).optional(),
    /** the outcome's anticipated mean and SD (Riley criterion iv) */
    outcome: z.object({ mean: z.number(), sd: z.number().positive() }).optional(),
    /**
     * variable selection: the candidate terms by name (predictors or "a:b" interactions; a
     * category enters and leaves with all its indicator columns) and the terms forced in. A
     * bare number (older plans) only counts candidate parameters for the df budget.
     */
    selection: z
      .object({
        candidates: z.union([
          z.number().int().min(1),
          z.array(name).min(1, "name at least one candidate term"),
        ]),
        required: z.array(name).optional(),
      })
      .optional(),
    thresholds: thresholdsSchema.default({}),
  })
  .superRefine((plan, ctx) => {
    const seen = new Map<string, number>();
    plan.columns.forEach((c, i) => {
      const prior = seen.get(c.name);
      if (prior !== undefined) {
        ctx.addIssue({
          code: "custom",
          path: ["columns", i, "name"],
          message: `"${c.name}" is already column ${prior + 1}; column names must be unique`,
        });
      }
      seen.set(c.name, i);
      if (c.levels && c.type !== "category") {
        ctx.addIssue({
          code: "custom",
          path: ["columns", i, "levels"],
          message: `levels only apply to category columns; "${c.name}" is ${c.type}`,
        });
      }
      if (c.levels) {
        const dup = c.levels.find((l, j) => c.levels!.indexOf(l) !== j);
        if (dup !== undefined)
          ctx.addIssue({
            code: "custom",
            path: ["columns", i, "levels"],
            message: `level "${dup}" is listed twice`,
          });
      }
      if (c.baseline !== undefined) {
        if (c.type !== "category") {
          ctx.addIssue({
            code: "custom",
            path: ["columns", i, "baseline"],
            message: `a baseline only applies to category columns`,
          });
        } else if (c.levels && !c.levels.includes(c.baseline)) {
          ctx.addIssue({
            code: "custom",
            path: ["columns", i, "baseline"],
            message: `baseline "${c.baseline}" is not among the levels of "${c.name}" (${c.levels.join(", ")})`,
          });
        }
      }
      if (c.min !== undefined && c.max !== undefined && c.min > c.max) {
        ctx.addIssue({
          code: "custom",
          path: ["columns", i, "min"],
          message: `min ${c.min} is above max ${c.max}`,
        });
      }
      if ((c.role === "response" || c.role === "predictor") && (c.type === "text" || c.type === "date")) {
        ctx.addIssue({
          code: "custom",
          path: ["columns", i, "type"],
          message: `a ${c.role} must be number, integer, category or boolean; "${c.name}" is ${c.type}`,
        });
      }
      if (c.role === "response" && c.type === "category") {
        ctx.addIssue({
          code: "custom",
          path: ["columns", i, "type"],
          message: `the response must be numeric for a linear model; "${c.name}" is a category`,
        });
      }
    });
    const responses = plan.columns.filter((c) => c.role === "response");
    if (responses.length !== 1) {
      ctx.addIssue({
        code: "custom",
        path: ["columns"],
        message:
          responses.length === 0
            ? "the plan needs exactly one response column; none is marked"
            : `the plan needs exactly one response column; ${responses.map((c) => `"${c.name}"`).join(" and ")} are marked`,
      });
    }
    const predictors = new Set(plan.columns.filter((c) => c.role === "predictor").map((c) => c.name));
    plan.interactions.forEach(([a, b], i) => {
      for (const [j, n] of [a, b].entries()) {
        if (!predictors.has(n)) {
          ctx.addIssue({
            code: "custom",
            path: ["interactions", i, j],
            message: `interaction term "${a}:${b}": "${n}" is not a planned predictor`,
          });
        }
      }
      if (a === b)
        ctx.addIssue({
          code: "custom",
          path: ["interactions", i],
          message: `an interaction needs two different predictors ("${a}:${b}")`,
        });
    });
    if (plan.selection)
      selectionIssues(plan, predictors).forEach((i) => ctx.addIssue({ code: "custom", ...i }));
    const t = { ...DEFAULT_THRESHOLDS, ...plan.thresholds };
    if (t.missingWarning > t.missingBlocker) {
      ctx.addIssue({
        code: "custom",
        path: ["thresholds", "missingWarning"],
        message: "the missingness warning level is above the blocker level",
      });
    }
    if (t.vifWarning > t.vifStrong) {
      ctx.addIssue({
        code: "custom",
        path: ["thresholds", "vifWarning"],
        message: "the VIF warning level is above the strong-warning level",
      });
    }
  });

/** Every selection term must be a planned predictor or interaction, named once, in one list. */
function selectionIssues(
  plan: {
    interactions: [string, string][];
    selection?: { candidates: number | string[]; required?: string[] };
  },
  predictors: Set<string>,
): { path: (string | number)[]; message: string }[] {
  const out: { path: (string | number)[]; message: string }[] = [];
  const terms = new Set([...predictors, ...plan.interactions.map(([a, b]) => `${a}:${b}`)]);
  const seen = new Map<string, string>();
  const lists: ["candidates" | "required", string[]][] = [["required", plan.selection!.required ?? []]];
  if (Array.isArray(plan.selection!.candidates)) lists.unshift(["candidates", plan.selection!.candidates]);
  for (const [key, names] of lists) {
    names.forEach((t, i) => {
      const path = ["selection", key, i];
      if (!terms.has(t))
        out.push({
          path,
          message: `selection term "${t}" is not a planned predictor or interaction (${[...terms].join(", ") || "none planned"})`,
        });
      const prior = seen.get(t);
      if (prior)
        out.push({
          path,
          message:
            prior === key
              ? `selection term "${t}" is listed twice`
              : `"${t}" is both a candidate and a required term; keep it in one list`,
        });
      seen.set(t, key);
    });
  }
  return out;
}

export type PlanInput = z.input<typeof planSchema>;
export type Plan = z.output<typeof planSchema>;

/** A field-level problem with a plan, for forms and the CLI. */
export interface PlanIssue {
  path: string;
  message: string;
}

/** Parse a plan; on failure return every problem with the field it concerns. */
export function parsePlan(input: unknown): { ok: true; plan: Plan } | { ok: false; issues: PlanIssue[] } {
  const r = planSchema.safeParse(input);
  if (r.success) return { ok: true, plan: r.data };
  return {
    ok: false,
    issues: r.error.issues.map((i) => ({ path: i.path.map(String).join("."), message: i.message })),
  };
}

/** The thresholds in force: the plan's overrides on top of the defaults. */
export function thresholdsOf(plan: Plan): Thresholds {
  return { ...DEFAULT_THRESHOLDS, ...plan.thresholds } as Thresholds;
}
