/**
 * Model-level findings about the data itself: missingness and category levels. They are
 * computed from the engine state, so the pool gets them too; row evidence is attached when
 * the live pass has it.
 */
import { finding, list, pct, quote, rowsOf as nRows, sampleOf } from "./findings";
import type { Plan, Thresholds } from "./plan";
import type { Finding } from "./report";
import { patternLimit, type EngineState } from "./state";
import { foldLevel, oneEditApart } from "./values";

/** Row evidence only a pass over the file has (absent for a pool). */
export interface Evidence {
  missingRows: Map<string, number[]>;
  responseMissingRows: number[];
  /** column → level → sample rows */
  levelRows: Map<string, Map<string, number[]>>;
}

export function missingFindings(
  state: EngineState,
  plan: Plan,
  t: Thresholds,
  ev: Evidence | null,
  mcar: { statistic: number; df: number; pValue: number } | null,
): Finding[] {
  const out: Finding[] = [];
  const byName = new Map(state.columns.map((c) => [c.name, c]));
  for (const pc of plan.columns) {
    if (pc.role === "ignore") continue;
    const c = byName.get(pc.name);
    if (!c || c.total === 0 || c.missing === 0) continue;
    const frac = c.missing / c.total;
    // the thresholds guard the planned model and the keys; a carried column's gaps cost the model nothing
    const graded = pc.role === "response" || pc.role === "predictor" || pc.role === "key";
    const severity = !graded
      ? frac > t.missingNote
        ? "note"
        : null
      : frac >= t.missingBlocker
        ? "blocker"
        : frac >= t.missingWarning
          ? "warning"
          : frac > t.missingNote
            ? "note"
            : null;
    if (!severity) continue;
    out.push(
      finding(
        "missing.column",
        severity,
        [pc.name],
        `${quote(pc.name)} is missing in ${c.missing.toLocaleString("en")} of ${c.total.toLocaleString("en")} rows (${pct(frac)})${graded ? "" : `; it is carried along, not part of the planned model, so this is only a note`}.`,
        !graded
          ? `Nothing to do if ${quote(pc.name)} is often left blank on purpose; fill it in where the value is known.`
          : severity === "note"
            ? `Fill in the missing values of ${quote(pc.name)} where they are known; leave the cell empty only where the value was not recorded.`
            : `Recover the missing values of ${quote(pc.name)} from the field records before sending the batch; at ${pct(frac)} missing the rows are lost to the model.`,
        { rows: ev?.missingRows.get(pc.name) ?? [], rowCount: c.missing, detail: { fraction: frac } },
      ),
    );
  }
  const resp = plan.columns.find((c) => c.role === "response");
  if (resp && state.responseMissing > 0) {
    out.push(
      finding(
        "missing.response",
        "warning",
        [resp.name],
        `${state.responseMissing.toLocaleString("en")} rows have no value for the response ${quote(resp.name)}; they cannot enter the model.`,
        `Add the measured ${quote(resp.name)} to these rows, or remove rows that were never measured.`,
        {
          rows: ev?.responseMissingRows ?? [],
          rowCount: state.responseMissing,
        },
      ),
    );
  }
  const { total, complete } = state.rows;
  const cols = state.patterns.columns;
  if (total > 0 && complete < total) {
    const costs = cols
      .map((name, i) => ({ column: name, rows: state.soleUnusable[i] ?? 0 }))
      .sort((a, b) => b.rows - a.rows);
    const top = costs[0];
    out.push(
      finding(
        "missing.complete-cases",
        "note",
        top && top.rows > 0 ? [top.column] : [],
        `${complete.toLocaleString("en")} of ${total.toLocaleString("en")} rows (${pct(complete / total)}) are complete for the planned model.` +
          (top && top.rows > 0
            ? ` ${quote(top.column)} costs most: ${nRows(top.rows)} ${top.rows === 1 ? "is" : "are"} incomplete only because of it.`
            : ""),
        top && top.rows > 0
          ? `Completing ${quote(top.column)} would recover the most rows for the model.`
          : "Complete the missing or unusable values of the model columns.",
        { rowCount: total - complete, detail: { complete, total, costs } },
      ),
    );
  }
  if (state.patterns.overflowed) {
    out.push(
      finding(
        "missing.pattern",
        "note",
        [],
        `The rows with gaps in the model columns fall into more than ${patternLimit(cols.length).toLocaleString("en")} different combinations of missing columns: the gaps are scattered, not shared by a few patterns, so none is listed.`,
        "Look at the missing counts of each column; scattered gaps usually have many separate causes rather than one skipped form.",
        { detail: { patterns: [], limit: patternLimit(cols.length) } },
      ),
    );
  } else if (state.patterns.masks.length > 0) {
    const patterns = [...state.patterns.masks]
      .sort((a, b) => b[1] - a[1])
      .slice(0, 5)
      .map(([mask, count]) => ({ columns: cols.filter((_, i) => mask[i] === "1"), count }));
    out.push(
      finding(
        "missing.pattern",
        "note",
        [...new Set(patterns.flatMap((p) => p.columns))],
        `Most frequent missingness patterns among the model columns: ${patterns.map((p) => `${p.columns.join(" + ")} missing in ${nRows(p.count)}`).join("; ")}.`,
        "Check whether the same rows lose several values together (a skipped form, a broken sensor); such gaps are worth recovering at the source.",
        { detail: { patterns } },
      ),
    );
  }
  if (mcar && mcar.pValue < t.mcarAlpha) {
    out.push(
      finding(
        "missing.not-at-random-hint",
        "note",
        state.patterns.columns,
        `Little's test says the values are not missing completely at random (χ² = ${mcar.statistic.toFixed(2)} on ${mcar.df} df, p = ${mcar.pValue.toPrecision(3)}): rows with gaps differ from complete rows.`,
        "Find out why values are missing (which plots, dates, operators); dropping the incomplete rows may bias the model.",
        { detail: { ...mcar } },
      ),
    );
  }
  return out;
}

export function levelFindings(state: EngineState, plan: Plan, t: Thresholds, ev: Evidence | null): Finding[] {
  const out: Finding[] = [];
  const byName = new Map(state.columns.map((c) => [c.name, c]));
  for (const pc of plan.columns) {
    if (pc.type !== "category" || pc.role === "ignore") continue;
    const c = byName.get(pc.name);
    if (!c || !c.levels) continue;
    const observed = c.levels.filter((l) => l[1] > 0);
    const planned = pc.levels ?? [];
    const closed = planned.length > 0 && !pc.openLevels;
    const rowsOf = (l: string) => ev?.levelRows.get(pc.name)?.get(l) ?? [];
    if (closed) {
      const unknown = observed.filter((l) => !planned.includes(l[0]));
      if (unknown.length) {
        const count = unknown.reduce((s, l) => s + l[1], 0);
        out.push(
          finding(
            "level.unknown",
            "blocker",
            [pc.name],
            `${quote(pc.name)} has ${unknown.length} level${unknown.length > 1 ? "s" : ""} not in the plan: ${list(unknown.map((l) => `${quote(l[0])} (${nRows(l[1])})`))}. Allowed: ${list(planned.map(quote), 20)}.`,
            `Correct these values to one of the plan's levels (${list(planned, 20)}), or ask the analyst to add the level to the data plan.`,
            {
              rows: sampleOf(
                unknown.map((l) => rowsOf(l[0])),
                t.sampleRows,
              ),
              rowCount: count,
              detail: { levels: unknown.map((l) => ({ level: l[0], count: l[1] })) },
            },
          ),
        );
      }
    }
    // spelling variants: equal after folding, or one edit apart (folded, at least 4 characters)
    const names = observed.map((l) => l[0]);
    const candidates = [...new Set([...planned, ...names])];
    const countOf = new Map(observed.map((l) => [l[0], l[1]]));
    const merges: { from: string; to: string; count: number }[] = [];
    const near = (a: string, b: string) => {
      const fa = foldLevel(a);
      const fb = foldLevel(b);
      return fa === fb || (Math.min(fa.length, fb.length) >= 4 && oneEditApart(fa, fb));
    };
    if (candidates.length <= 500) {
      // each level outside the plan (or, with no plan list, each rarer level) merges into one target:
      // a planned level when one is near, else the most frequent near level
      const byCount = [...names].sort((a, b) => (countOf.get(b) ?? 0) - (countOf.get(a) ?? 0));
      for (const from of names) {
        if (planned.includes(from)) continue;
        const folded = foldLevel(from);
        let to = planned.find((l) => foldLevel(l) === folded) ?? planned.find((l) => near(from, l));
        const cf = countOf.get(from) ?? 0;
        const commoner = (l: string) =>
          (countOf.get(l) ?? 0) > cf || ((countOf.get(l) ?? 0) === cf && l > from);
        // a closed list merges only onto its own levels; an open (or absent) list onto the most frequent near spelling
        if (to === undefined && !closed) {
          const ok = (l: string) => l !== from && !planned.includes(l) && commoner(l);
          to =
            byCount.find((l) => ok(l) && foldLevel(l) === folded) ??
            byCount.find((l) => ok(l) && near(from, l));
        }
        if (to !== undefined) merges.push({ from, to, count: countOf.get(from) ?? 0 });
      }
    }
    if (merges.length) {
      out.push(
        finding(
          "level.variant",
          "warning",
          [pc.name],
          `${quote(pc.name)} has spelling variants of the same level: ${list(merges.map((m) => `${quote(m.from)} → ${quote(m.to)} (${nRows(m.count)})`))}.`,
          `Merge the variants: ${merges.map((m) => `write ${quote(m.to)} instead of ${quote(m.from)}`).join("; ")}.`,
          {
            rows: sampleOf(
              merges.map((m) => rowsOf(m.from)),
              t.sampleRows,
            ),
            rowCount: merges.reduce((s, m) => s + m.count, 0),
            detail: { merges },
          },
        ),
      );
    }
    const nonMissing = c.total - c.missing;
    const distinct = observed.length + (c.levelOverflow > 0 ? 1 : 0);
    if (distinct > t.tooManyLevels || (nonMissing >= 20 && distinct > t.identifierShare * nonMissing)) {
      out.push(
        finding(
          "level.too-many",
          "warning",
          [pc.name],
          `${quote(pc.name)} has ${c.levelOverflow > 0 ? "more than " : ""}${observed.length.toLocaleString("en")} distinct levels${distinct > t.identifierShare * nonMissing ? ", nearly one per row: it looks like an identifier, not a factor" : ""}.`,
          `Check that ${quote(pc.name)} is the intended column; as a predictor it would add ${observed.length - 1} indicator columns. Group rare levels or mark the column as a key.`,
          { detail: { levels: observed.length, overflow: c.levelOverflow > 0 } },
        ),
      );
    }
    if (pc.role !== "predictor") continue;
    const design = state.design.levels[pc.name] ?? [];
    const complete = new Map(c.levels.map((l) => [l[0], l[2]]));
    const baseline = design[0];
    if (state.rows.complete > 0) {
      const present = design.filter((l) => (complete.get(l) ?? 0) > 0);
      if (present.length <= 1) {
        out.push(
          finding(
            "level.single",
            "blocker",
            [pc.name],
            present.length === 1
              ? `Every complete row of ${quote(pc.name)} has the same level ${quote(present[0]!)}: no indicator column can be estimated.`
              : `No complete row has a planned level of ${quote(pc.name)}.`,
            `A batch needs rows from at least two levels of ${quote(pc.name)} for the planned model; add the rows of the other levels, or ask the analyst whether this batch is checked within the pool only.`,
            { detail: { levels: present } },
          ),
        );
      }
      if (baseline !== undefined && (complete.get(baseline) ?? 0) === 0) {
        out.push(
          finding(
            "level.baseline-absent",
            "warning",
            [pc.name],
            `The baseline level ${quote(baseline)} of ${quote(pc.name)} has no complete rows; the other levels cannot be compared with it.`,
            `Ask the analyst to choose a baseline that this batch has (e.g. ${quote(present[0] ?? design[1] ?? baseline)}), or add rows with ${quote(baseline)}.`,
          ),
        );
      }
      const sparse = design.filter(
        (l, i) => (i > 0 || (complete.get(l) ?? 0) > 0) && (complete.get(l) ?? 0) < t.sparseLevel,
      );
      if (sparse.length) {
        out.push(
          finding(
            "level.sparse",
            "warning",
            [pc.name],
            `${quote(pc.name)} has level${sparse.length > 1 ? "s" : ""} with fewer than ${t.sparseLevel} complete rows: ${list(sparse.map((l) => `${quote(l)} (${complete.get(l) ?? 0})`))}; ${sparse.length > 1 ? "their coefficients are" : "its coefficient is"} poorly determined${sparse.some((l) => (complete.get(l) ?? 0) === 0) ? " (a level with no rows cannot be estimated at all)" : ""}.`,
            `Collect more rows for these levels, or ask the analyst to merge them with a related level.`,
            {
              rows: sampleOf(
                sparse.map((l) => rowsOf(l)),
                t.sampleRows,
              ),
              detail: { levels: sparse.map((l) => ({ level: l, complete: complete.get(l) ?? 0 })) },
            },
          ),
        );
      }
    }
  }
  return out;
}
