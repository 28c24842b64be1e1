/**
 * The pool: figures for the union of accepted batches from their stored states, and the
 * drift of a new batch against the pool.
 */
import { Moments } from "./accumulators";
import { analyse, designOf } from "./analyse";
import { checkedReport, hashPlan } from "./check";
import { finding, pct, quote, rowsOf, sortFindings } from "./findings";
import { thresholdsOf, type Plan } from "./plan";
import type { Finding, ReadinessReport } from "./report";
import { buildReport } from "./report-build";
import { isEngineState, mergeStates, type EngineState } from "./state";

/**
 * The report of a pool: the states of its batches merged (least-squares factors, moments,
 * level tables, missingness patterns), then the same model-level checks as for one batch.
 * Gives the same figures as checkBatch on the concatenated files (quartiles aside: from a
 * merged sample). Row-level findings need the files and are not repeated.
 */
export async function poolReport(states: unknown[], plan: Plan): Promise<ReadinessReport> {
  const t0 = Date.now();
  const valid = states.filter(isEngineState);
  if (valid.length !== states.length)
    throw new RangeError(
      `poolReport: ${states.length - valid.length} of ${states.length} states are not engine states`,
    );
  const t = thresholdsOf(plan);
  const planHash = await hashPlan(plan);
  const merged = valid.length ? mergeStates(valid, (levels) => designOf(plan, levels, true).columns) : null;
  if (!merged) {
    const findings = [
      finding(
        "pool.empty",
        "note",
        [],
        "The pool has no accepted batches yet.",
        "Accept a batch to start the pool.",
      ),
    ];
    return buildReport({ status: "checked", plan, planHash, findings, ms: Date.now() - t0 });
  }
  const a = analyse(merged, plan, t);
  const findings = sortFindings(a.findings);
  return checkedReport(a, findings, planHash, merged, Date.now() - t0);
}

/**
 * Drift of a batch against the pool [lib/readiness/CHECKS.md "Pool and drift"]: levels new to the pool,
 * standardized mean difference per numeric planned column, SMD = (x̄_b − x̄_p)/√((s_b² + s_p²)/2)
 * (|SMD| ≥ 0.25 warning [cp]), and missingness that moved by more than 10 points.
 */
export function driftFindings(poolState: unknown, batchState: unknown, plan: Plan): Finding[] {
  if (!isEngineState(poolState) || !isEngineState(batchState))
    throw new RangeError("driftFindings needs two engine states");
  const t = thresholdsOf(plan);
  const out: Finding[] = [];
  const pool = new Map(poolState.columns.map((c) => [c.name, c]));
  const batch = new Map(batchState.columns.map((c) => [c.name, c]));
  if (poolState.rows.total === 0) return out;
  for (const pc of plan.columns) {
    if (pc.role === "ignore") continue;
    const p = pool.get(pc.name);
    const b = batch.get(pc.name);
    if (!p || !b || b.total === 0) continue;
    if (pc.type === "category" && b.levels) {
      const known = new Set((p.levels ?? []).filter((l) => l[1] > 0).map((l) => l[0]));
      const fresh = b.levels.filter((l) => l[1] > 0 && !known.has(l[0]));
      if (fresh.length) {
        out.push(
          finding(
            "drift.new-level",
            pc.role === "predictor" ? "warning" : "note",
            [pc.name],
            `${quote(pc.name)} has level${fresh.length > 1 ? "s" : ""} not seen in the pool: ${fresh.map((l) => `${quote(l[0])} (${rowsOf(l[1])})`).join(", ")}.`,
            "Check that the new levels are genuine; a new level adds an indicator column to the pooled model.",
            {
              rowCount: fresh.reduce((s, l) => s + l[1], 0),
              detail: { levels: fresh.map((l) => ({ level: l[0], count: l[1] })) },
            },
          ),
        );
      }
    }
    if (
      (pc.type === "number" || pc.type === "integer") &&
      p.moments &&
      b.moments &&
      p.moments.n > 1 &&
      b.moments.n > 1
    ) {
      const mp = Moments.fromJSON(p.moments);
      const mb = Moments.fromJSON(b.moments);
      const sd = Math.sqrt((mp.sd ** 2 + mb.sd ** 2) / 2);
      const smd = sd > 0 ? (mb.mean - mp.mean) / sd : 0;
      if (Math.abs(smd) >= t.smd) {
        out.push(
          finding(
            "drift.smd",
            "warning",
            [pc.name],
            `The mean of ${quote(pc.name)} is ${mb.mean.toPrecision(4)} in this batch against ${mp.mean.toPrecision(4)} in the pool: standardized difference ${smd.toFixed(2)}.`,
            "Check units and recording (e.g. kg vs t, a changed instrument); if the difference is real, tell the analyst.",
            {
              detail: { smd, batchMean: mb.mean, poolMean: mp.mean, batchSd: mb.sd, poolSd: mp.sd },
            },
          ),
        );
      }
    }
    const fp = p.total > 0 ? p.missing / p.total : 0;
    const fb = b.missing / b.total;
    if (Math.abs(fb - fp) > t.missingDrift) {
      out.push(
        finding(
          "drift.missing",
          "warning",
          [pc.name],
          `${quote(pc.name)} is missing in ${pct(fb)} of this batch's rows against ${pct(fp)} in the pool.`,
          `Find out why ${quote(pc.name)} is ${fb > fp ? "missing more often" : "recorded differently"} in this batch.`,
          {
            detail: { batch: fb, pool: fp },
          },
        ),
      );
    }
  }
  return out;
}

export type { EngineState };
