/**
 * Findings that need the rows themselves (structure, types and values); only a pass over a
 * file produces them, with sample row numbers as a spreadsheet shows them.
 */
import type { ColumnScan } from "./column-scan";
import { finding, list, pct, quote, rowsOf } from "./findings";
import type { Finding } from "./report";
import type { Scan } from "./scan";

const fmt = (n: number) => n.toLocaleString("en");

/** A suspected sentinel: one repeated extreme value far outside the rest of the column. */
export function suspectedSentinel(
  c: ColumnScan,
): { value: number; count: number; rows: number[]; z: number } | null {
  const m = c.moments;
  for (const e of [c.lo, c.hi]) {
    if (e.count < 2 || !Number.isFinite(e.v) || m.n - e.count < 5) continue;
    const restN = m.n - e.count;
    const sum = m.mean * m.n - e.v * e.count;
    const sumsq = m.m2 + m.mean * m.mean * m.n - e.v * e.v * e.count;
    const mean = sum / restN;
    const varr = Math.max(0, (sumsq - restN * mean * mean) / Math.max(1, restN - 1));
    const sd = Math.sqrt(varr);
    const gap = Math.abs(e.v - e.next);
    const spread = Math.max(sd, Number.EPSILON * Math.abs(mean) + 1e-12);
    const z = Math.abs(e.v - mean) / spread;
    if (z >= 6 && gap / spread >= 3) return { value: e.v, count: e.count, rows: e.rows, z };
  }
  return null;
}

export function rowFindings(scan: Scan): Finding[] {
  const out: Finding[] = [];
  const plan = scan.plan;
  for (const d of scan.duplicateHeaders) {
    out.push(
      finding(
        "header.duplicate",
        "blocker",
        [d.name],
        `The column name ${quote(d.name)} appears ${d.positions.length} times (columns ${d.positions.map((p) => p + 1).join(", ")}); only the first is read.`,
        `Rename or remove the repeated ${quote(d.name)} columns so that every column name is unique.`,
        {
          rows: [1],
          detail: { positions: d.positions.map((p) => p + 1) },
        },
      ),
    );
  }
  if (scan.blankHeaders.length) {
    out.push(
      finding(
        "header.blank",
        "blocker",
        [],
        `Column${scan.blankHeaders.length > 1 ? "s" : ""} ${scan.blankHeaders.map((p) => p + 1).join(", ")} ha${scan.blankHeaders.length > 1 ? "ve" : "s"} no name in the header row.`,
        "Give every column a name in row 1, or delete empty columns (check for stray delimiters at the end of the header).",
        {
          rows: [1],
          detail: { positions: scan.blankHeaders.map((p) => p + 1) },
        },
      ),
    );
  }
  const names = new Set(scan.header.map((h) => h.trim()));
  for (const pc of plan.columns) {
    if (names.has(pc.name)) continue;
    if (pc.role === "response" || pc.role === "predictor" || pc.role === "key") {
      const near = [...names].find(
        (h) => h.toLowerCase().replace(/[\s_-]/g, "") === pc.name.toLowerCase().replace(/[\s_-]/g, ""),
      );
      out.push(
        finding(
          "plan.column-missing",
          "blocker",
          [pc.name],
          `The planned ${pc.role} column ${quote(pc.name)} is not in the file${near ? ` (there is a column ${quote(near)})` : ""}.`,
          near
            ? `Rename the column ${quote(near)} to ${quote(pc.name)} in the header row.`
            : `Add the column ${quote(pc.name)} with the header spelled exactly so.`,
          {
            rows: [1],
          },
        ),
      );
    }
  }
  const known = new Set(plan.columns.map((c) => c.name));
  const unexpected = [...names].filter((h) => h !== "" && !known.has(h));
  if (unexpected.length) {
    out.push(
      finding(
        "plan.column-unexpected",
        "note",
        unexpected,
        `The file has column${unexpected.length > 1 ? "s" : ""} the plan does not know: ${list(unexpected.map(quote))}; ${unexpected.length > 1 ? "they are" : "it is"} kept but not checked.`,
        "Nothing to do if the extra columns are intended; otherwise remove them or ask the analyst to add them to the plan.",
        {
          rows: [1],
        },
      ),
    );
  }
  if (scan.ragged.count) {
    const widths = [...scan.raggedWidths.entries()].sort((a, b) => b[1] - a[1]);
    out.push(
      finding(
        "row.ragged",
        "blocker",
        [],
        `${fmt(scan.ragged.count)} row${scan.ragged.count > 1 ? "s have" : " has"} a different number of fields than the header's ${scan.header.length} (${widths
          .slice(0, 3)
          .map(([w, c]) => `${fmt(c)} with ${w}`)
          .join(", ")}); ${scan.ragged.count > 1 ? "they were" : "it was"} left out.`,
        "Check these rows for an unquoted delimiter inside a value (put such values in double quotes) or for missing/extra cells.",
        {
          rows: scan.ragged.rows,
          rowCount: scan.ragged.count,
          detail: { widths: Object.fromEntries(widths) },
        },
      ),
    );
  }
  if (scan.duplicateRows.count) {
    out.push(
      finding(
        "row.duplicate",
        "warning",
        [],
        `${fmt(scan.duplicateRows.count)} row${scan.duplicateRows.count > 1 ? "s repeat" : " repeats"} an earlier row exactly (e.g. ${scan.duplicateOf
          .slice(0, 3)
          .map(([a, b]) => `row ${a} = row ${b}`)
          .join(", ")}).`,
        "Remove the repeated rows if they were copied twice; if they are genuine repeat measurements, add a column that tells them apart.",
        {
          rows: scan.duplicateRows.rows,
          rowCount: scan.duplicateRows.count,
          detail: { pairs: scan.duplicateOf },
        },
      ),
    );
  }
  for (const [k, key] of scan.keys) {
    if (!key.dup.count) continue;
    const name = scan.cols[k]!.name;
    out.push(
      finding(
        "key.duplicate",
        "blocker",
        [name],
        `The key ${quote(name)} repeats in ${rowsOf(key.dup.count)}${key.examples.size ? ` (e.g. ${list([...key.examples.keys()].slice(0, 5).map(quote))})` : ""}.`,
        `Every row needs its own value of ${quote(name)}; correct the repeated keys or remove duplicated rows.`,
        {
          rows: key.dup.rows,
          rowCount: key.dup.count,
          detail: { examples: Object.fromEntries(key.examples) },
        },
      ),
    );
  }
  for (const c of scan.cols) {
    const pc = c.plan;
    if (!pc || pc.role === "ignore") continue;
    const modelRole = pc.role === "response" || pc.role === "predictor";
    if (c.mismatch.count) {
      const offenders = [...c.offenders.entries()].sort((a, b) => b[1] - a[1]);
      out.push(
        finding(
          "type.mismatch",
          modelRole ? "blocker" : "warning",
          [c.name],
          `${fmt(c.mismatch.count)} value${c.mismatch.count > 1 ? "s" : ""} of ${quote(c.name)} ${c.mismatch.count > 1 ? "are" : "is"} not ${article(pc.type)}: ${list(
            offenders.map(([v, n]) => `${quote(v)} × ${fmt(n)}`),
            10,
          )}.`,
          `Correct these cells to ${article(pc.type)}${pc.type === "integer" ? " (whole numbers)" : ""}; write a missing value as an empty cell${
            plan.missingTokens.filter((x) => x !== "").length
              ? ` or ${plan.missingTokens
                  .filter((x) => x !== "")
                  .map(quote)
                  .join(", ")}`
              : ""
          }.`,
          {
            rows: c.mismatch.rows,
            rowCount: c.mismatch.count,
            detail: {
              offenders: offenders.map(([value, count]) => ({ value, count })),
              distinctCapped: c.offenders.size >= 50,
            },
          },
        ),
      );
    }
    if (c.comma.count) {
      out.push(
        finding(
          "number.decimal-comma",
          "blocker",
          [c.name],
          `${fmt(c.comma.count)} number${c.comma.count > 1 ? "s" : ""} in ${quote(c.name)} use a decimal comma (e.g. ${c.commaExamples.map(quote).join(", ")}).`,
          "Export the file with a point as decimal separator (in the spreadsheet's regional settings choose English, or replace “,” by “.” in the numeric columns before saving).",
          { rows: c.comma.rows, rowCount: c.comma.count, detail: { examples: c.commaExamples } },
        ),
      );
    }
    for (const [v, r] of c.sentinels) {
      out.push(
        finding(
          "number.sentinel",
          "warning",
          [c.name],
          `${quote(c.name)} holds the declared missing-value code ${v} in ${rowsOf(r.count)}; they are read as missing.`,
          `Leave the cells empty instead of writing ${v}, so that nobody mistakes it for a measurement.`,
          {
            rows: r.rows,
            rowCount: r.count,
            detail: { value: v, declared: true },
          },
        ),
      );
    }
    if (c.kind === "number" || c.kind === "integer") {
      const s = suspectedSentinel(c);
      if (s && !c.sentinels.has(s.value)) {
        out.push(
          finding(
            "number.sentinel",
            "warning",
            [c.name],
            `${quote(c.name)} holds ${s.value} in ${rowsOf(s.count)}, far outside its other values (${s.z.toFixed(0)} standard deviations away): probably a code for “missing”.`,
            `If ${s.value} means “not measured”, leave those cells empty (or ask the analyst to declare ${s.value} as a missing-value code in the plan); otherwise correct the values.`,
            { rows: s.rows, rowCount: s.count, detail: { value: s.value, declared: false, z: s.z } },
          ),
        );
      }
    }
    if (c.range.count) {
      const bounds = [
        pc.min !== undefined ? `min ${pc.min}` : null,
        pc.max !== undefined ? `max ${pc.max}` : null,
      ]
        .filter(Boolean)
        .join(", ");
      out.push(
        finding(
          "value.out-of-range",
          "blocker",
          [c.name],
          `${fmt(c.range.count)} value${c.range.count > 1 ? "s" : ""} of ${quote(c.name)} lie outside the plan's range (${bounds}), e.g. ${c.rangeExamples.join(", ")}.`,
          `Check the units and typing of these cells; correct them or leave them empty if the true value is unknown.`,
          {
            rows: c.range.rows,
            rowCount: c.range.count,
            detail: { min: pc.min, max: pc.max, examples: c.rangeExamples },
          },
        ),
      );
    }
    if (
      c.kind === "date" &&
      c.date.ambiguous &&
      c.date.ambiguous.count &&
      !pc.dateFormat &&
      !(c.date.a13 > 0 && c.date.b13 === 0) &&
      !(c.date.b13 > 0 && c.date.a13 === 0)
    ) {
      out.push(
        finding(
          "date.ambiguous",
          "warning",
          [c.name],
          `${fmt(c.date.ambiguous.count)} date${c.date.ambiguous.count > 1 ? "s" : ""} in ${quote(c.name)} (${pct(c.date.ambiguous.count / Math.max(1, c.total - c.missing.count))}) could be day/month or month/day, and no value settles the order.`,
          "Write dates as YYYY-MM-DD (ISO 8601), or ask the analyst to state the date format in the plan.",
          { rows: c.date.ambiguous.rows, rowCount: c.date.ambiguous.count },
        ),
      );
    }
  }
  return out;
}

export function article(type: string): string {
  return (
    {
      number: "a number",
      integer: "an integer",
      boolean: "a yes/no value",
      date: "a date",
      category: "a level",
      text: "text",
    }[type] ?? type
  );
}
