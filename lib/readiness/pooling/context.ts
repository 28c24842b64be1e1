/**
 * The pool as the questions see it: the treatment-coded design over the levels the accepted
 * batches have, each batch's factor for that design, and the rests (everything but one batch,
 * or one provider) by prefix and suffix merges.
 */
import { designOf } from "../analyse";
import type { Design } from "../design";
import { thresholdsOf, type Plan, type Thresholds } from "../plan";
import { isEngineState } from "../state";
import { factorOf, fitOf, mergeFactors, restsOf, selectColumns, type Factor, type Fit } from "./factor";
import type { PoolMember } from "./types";

export interface Unit {
  id: string;
  label: string;
  factor: Factor;
  /** the pool without this unit; null when nothing is left */
  rest: Factor | null;
}

export interface PoolContext {
  plan: Plan;
  t: Thresholds;
  design: Design;
  columns: string[];
  /** term of each design column ("intercept" for the intercept) */
  termOf: string[];
  all: Factor;
  fitAll: Fit;
  batches: Unit[];
  providers: Unit[];
  candidate: { unit: Unit; all: Factor; design: Design } | null;
}

/** Levels of several states united in order (as mergeStates does): the first batch's first level leads. */
export function unitedLevels(members: PoolMember[]): Record<string, string[]> {
  const levels: Record<string, string[]> = {};
  for (const m of members) {
    for (const [k, ls] of Object.entries(m.state.design.levels)) {
      const out = (levels[k] ??= []);
      for (const l of ls) if (!out.includes(l)) out.push(l);
    }
  }
  return levels;
}

export function termsOfColumns(design: Design): string[] {
  const byColumn = new Map<string, string>();
  for (const t of design.terms) for (const c of t.columns) byColumn.set(c, t.term);
  return design.columns.map((c) => byColumn.get(c) ?? "intercept");
}

function checkMember(m: PoolMember): void {
  if (!isEngineState(m.state))
    throw new RangeError(`batch ${m.label} has no engine state; check it again before pooling`);
}

/** Residual sum of squares of y about its mean (with an intercept) or about zero. */
export function tssOf(f: Factor, intercept: boolean): number {
  const K = f.columns.length + 1;
  if (intercept) {
    const i = f.columns.indexOf("intercept");
    const r = selectColumns(f, i >= 0 ? [i] : []);
    return r.a[3]! ** 2;
  }
  let s = 0;
  for (let i = 0; i < K; i++) s += f.a[i * K + K - 1]! ** 2;
  return s;
}

export function buildContext(members: PoolMember[], plan: Plan, candidate?: PoolMember): PoolContext {
  if (members.length === 0)
    throw new RangeError("the pool has no accepted batches yet; accept a batch to ask the pool's questions");
  for (const m of [...members, ...(candidate ? [candidate] : [])]) checkMember(m);
  const design = designOf(plan, unitedLevels(members));
  const columns = design.columns;
  const parts = members.map((m) => factorOf(m.state, columns));
  const r = restsOf(parts);
  const batches = members.map((m, i) => ({ id: m.id, label: m.label, factor: parts[i]!, rest: r.rest(i) }));
  const groupIds = [...new Set(members.map((m) => m.group))];
  let providers: Unit[] = [];
  if (groupIds.length > 1) {
    const gParts = groupIds.map((g) =>
      parts.filter((_, i) => members[i]!.group === g).reduce((a, b) => mergeFactors(a, b)),
    );
    const gr = restsOf(gParts);
    providers = groupIds.map((g, i) => ({
      id: g,
      label: members.find((m) => m.group === g)!.groupLabel,
      factor: gParts[i]!,
      rest: gr.rest(i),
    }));
  }
  let cand: PoolContext["candidate"] = null;
  if (candidate) {
    const cDesign = designOf(plan, unitedLevels([...members, candidate]));
    const pool = parts
      .map((_, i) => factorOf(members[i]!.state, cDesign.columns))
      .reduce((a, b) => mergeFactors(a, b));
    const own = factorOf(candidate.state, cDesign.columns);
    cand = {
      unit: { id: candidate.id, label: candidate.label, factor: own, rest: pool },
      all: mergeFactors(pool, own),
      design: cDesign,
    };
  }
  return {
    plan,
    t: thresholdsOf(plan),
    design,
    columns,
    termOf: termsOfColumns(design),
    all: r.all,
    fitAll: fitOf(r.all),
    batches,
    providers,
    candidate: cand,
  };
}
