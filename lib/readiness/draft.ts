/**
 * Plan drafting: read a sample file and propose a data plan for a person to correct.
 */
import { readCsv, type ByteInput } from "./csv-reader";
import { UnreadableError } from "./decode";
import type { Plan, PlanInput } from "./plan";
import { Scan } from "./scan";

export interface DraftResult {
  ok: boolean;
  /** the proposed plan (not yet valid when no response could be chosen) */
  plan: PlanInput | null;
  /** what the person should decide or check */
  notes: string[];
  /** why the file could not be read */
  error?: { message: string; fix: string };
}

const RESPONSE_NAMES = /^(y|yield|response|outcome|target|dependent)$/i;
const KEY_NAMES = /(^id$|_id$|^id_|^key$|^plot$|^plot_?id|^sample_?id|^record)/i;

/**
 * Propose a plan from a file: types, levels in order of frequency with the most frequent as
 * baseline, observed ranges. The response is chosen only when obvious (opts.response, or a
 * single column named like `yield`/`response`/`y`).
 */
export async function draftPlan(input: ByteInput, opts: { response?: string } = {}): Promise<DraftResult> {
  const base: Plan = {
    columns: [],
    intercept: true,
    interactions: [],
    missingTokens: ["", "NA"],
    thresholds: {},
  };
  const scan = new Scan(base);
  try {
    await readCsv(input, scan);
  } catch (e) {
    if (e instanceof UnreadableError)
      return { ok: false, plan: null, notes: [], error: { message: e.message, fix: e.fix } };
    throw e;
  }
  const notes: string[] = [];
  const seen = new Set<string>();
  const columns: PlanInput["columns"] = [];
  const numericNames: string[] = [];
  for (const c of scan.cols) {
    if (c.name === "" || seen.has(c.name)) {
      notes.push(
        c.name === ""
          ? "A column without a name was left out; give it a name in the file."
          : `The repeated column name “${c.name}” was drafted once.`,
      );
      continue;
    }
    seen.add(c.name);
    const inferred = c.inferredType();
    const nonMissing = c.total - c.missing.count;
    const levels = c.levels
      ? [...c.levels.entries()].sort((a, b) => b[1].count - a[1].count).map(([l]) => l)
      : [];
    const looksKey =
      KEY_NAMES.test(c.name) && c.levelOverflow === 0 && levels.length === nonMissing && nonMissing > 0;
    if (looksKey) {
      columns.push({ name: c.name, role: "key", type: inferred === "integer" ? "integer" : "text" });
      continue;
    }
    switch (inferred) {
      case "number":
      case "integer": {
        const m = c.moments;
        columns.push({
          name: c.name,
          role: "predictor",
          type: inferred,
          ...(m.n > 0 ? { min: m.min, max: m.max } : {}),
        });
        numericNames.push(c.name);
        if (c.infer.comma > 0)
          notes.push(`“${c.name}” has numbers with decimal commas; export the file with decimal points.`);
        break;
      }
      case "boolean":
        columns.push({ name: c.name, role: "predictor", type: "boolean" });
        break;
      case "category":
        if (levels.length > 50) {
          columns.push({ name: c.name, role: "carry", type: "text" });
          notes.push(`“${c.name}” has ${levels.length} distinct values; drafted as text, not a factor.`);
        } else {
          columns.push({ name: c.name, role: "predictor", type: "category", levels, baseline: levels[0] });
        }
        break;
      case "date":
        columns.push({ name: c.name, role: "carry", type: "date" });
        break;
      case "empty":
        columns.push({ name: c.name, role: "ignore", type: "text" });
        notes.push(`“${c.name}” is empty in the sample; drafted as ignored.`);
        break;
      default:
        columns.push({ name: c.name, role: "carry", type: "text" });
    }
  }
  let response = opts.response;
  if (!response) {
    const named = numericNames.filter((n) => RESPONSE_NAMES.test(n));
    if (named.length === 1) response = named[0];
  }
  const rc = response ? columns.find((c) => c.name === response) : undefined;
  if (rc && (rc.type === "number" || rc.type === "integer")) {
    rc.role = "response";
    notes.push(`“${rc.name}” was taken as the response; check that this is the outcome to model.`);
  } else {
    notes.push(
      `Choose the response: mark one numeric column (${numericNames.join(", ") || "none found"}) with role "response".`,
    );
  }
  notes.push(
    "Levels are listed by frequency, the most frequent as baseline; ranges are the sample's minimum and maximum: widen them to what is plausible.",
  );
  return {
    ok: rc !== undefined,
    plan: { columns, intercept: true, interactions: [], missingTokens: ["", "NA"] },
    notes,
  };
}
