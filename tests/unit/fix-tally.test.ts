/**
 * The fix tally reads fields from their bytes (lib/readiness/fixes/tally.ts): a clean number or
 * token-only field is settled without a string, a repeated value's outcome is remembered. Its
 * counts must equal the plain per-cell rule (cells.ts ruleFixer, the one place a value is
 * changed) applied to every field's text, on random files mixing the forms each shortcut must
 * not swallow: spaces, decimal commas, exponents, signs, tokens, sentinels, non-ASCII ends,
 * day/month pairs, and columns with far more distinct values than the tally remembers.
 */
import { describe, expect, test } from "vitest";
import { parsePlan, tallyFixes, type FixRule, type Plan } from "@/lib/readiness";
import { readCsv, type CsvSink } from "@/lib/readiness/csv-reader";
import { ruleFixer } from "@/lib/readiness/fixes/cells";
import { parseDate, readNumber } from "@/lib/readiness/values";
import { chunks, rng } from "../fixtures/engine/data";

const TOKENS = ["NA", "n/a", "-"];

function makePlan(): Plan {
  const p = parsePlan({
    columns: [
      { name: "code", role: "key", type: "text" },
      { name: "soil", role: "predictor", type: "category", levels: ["clay", "loam", "sand"] },
      { name: "rain", role: "predictor", type: "number", sentinels: [-999] },
      { name: "dose", role: "predictor", type: "number" },
      { name: "count", role: "predictor", type: "integer" },
      { name: "sown", role: "carry", type: "date" },
      { name: "yield", role: "response", type: "number" },
    ],
    missingTokens: TOKENS,
    model: { response: "yield", predictors: ["soil", "rain", "dose", "count"] },
  });
  if (!p.ok) throw new Error(p.issues.map((i) => i.message).join("; "));
  return p.plan;
}

/** The written forms a number cell takes: plain, spaced, comma, exponent, signed, token, sentinel, odd. */
function numberCell(r: () => number, wide: boolean): string {
  const v = (r() * (wide ? 100_000 : 30)).toFixed(r() < 0.5 ? 0 : 1 + Math.floor(r() * 3));
  const forms = [
    v,
    v,
    v,
    `-${v}`,
    ` ${v}`,
    `${v} `,
    v.replace(".", ","),
    `${v}e2`,
    `+${v}`,
    ".5",
    "5.",
    "1.234,5",
    "-999",
    "-999.0",
    "NA",
    " NA",
    "-",
    "n/a",
    "abc",
    `${v}\u00a0`,
    "0x1F",
    "12-3",
  ];
  return forms[Math.floor(r() * forms.length)]!;
}

function randomFile(seed: number, rows: number): string {
  const r = rng(seed);
  const pick = <T>(xs: readonly T[]) => xs[Math.floor(r() * xs.length)]!;
  const lines = ["code,soil,rain,dose,count,sown,yield"];
  for (let i = 0; i < rows; i++) {
    const cells = [
      r() < 0.05 ? pick(["NA", " P1", "n/a ", "Pé"]) : `P${i}`,
      pick(["clay", "Clay", "clay ", "lome", "loam", "sand", "SAND", "NA", "peat", "Cláy"]),
      numberCell(r, false),
      numberCell(r, true),
      r() < 0.8 ? String(Math.floor(r() * 5000)) : numberCell(r, false),
      pick([
        `${1 + Math.floor(r() * 28)}/${1 + Math.floor(r() * 12)}/2026`,
        "2026-05-01",
        "13/13/2026",
        "NA",
      ]),
      numberCell(r, true),
    ];
    lines.push(cells.map((c) => (/[",\n]/.test(c) ? `"${c.replace(/"/g, '""')}"` : c)).join(","));
  }
  return lines.join("\n") + "\n";
}

type Counts = Record<string, number>;

/** The oracle: every field's text through the rules directly, as the tally counted before it read bytes. */
async function plainCounts(text: string, plan: Plan): Promise<Counts> {
  const fields: string[][] = [];
  let header: string[] = [];
  const sink: CsvSink = {
    onHeader: (h) => (header = h),
    onRecords: (rows) => void fields.push(...rows),
  };
  await readCsv(chunks(text, 1021), sink);
  const out: Counts = {};
  const add = (k: string, yes: boolean) => void (out[k] = (out[k] ?? 0) + (yes ? 1 : 0));
  const rule = (rule: FixRule) => ruleFixer(rule);
  const tokens = rule({ kind: "empty-tokens", tokens: TOKENS });
  for (const pc of plan.columns) {
    const i = header.indexOf(pc.name);
    for (const row of fields) {
      const s = row[i] ?? "";
      if (s === "") continue;
      const t = s.trim();
      add(`${pc.name}.tokens`, tokens(s) !== null);
      if (pc.type === "number" || pc.type === "integer") {
        const v = readNumber(t);
        add(`${pc.name}.point`, v === v && /[.eE]/.test(t));
        add(`${pc.name}.comma`, rule({ kind: "decimal-comma" })(s) !== null);
        for (const x of pc.sentinels ?? [])
          add(`${pc.name}.sentinel${x}`, rule({ kind: "empty-numbers", values: [x] })(s) !== null);
      }
      if (pc.type === "category") add(`${pc.name}.trim`, rule({ kind: "trim", except: [] })(s) !== null);
      if (pc.type === "date") {
        const d = parseDate(t);
        add(`${pc.name}.a13`, d.kind === "pair" && d.a > 12);
        add(`${pc.name}.b13`, d.kind === "pair" && d.b > 12);
        add(`${pc.name}.dmy`, rule({ kind: "date", order: "dmy" })(s) !== null);
        add(`${pc.name}.mdy`, rule({ kind: "date", order: "mdy" })(s) !== null);
      }
    }
  }
  return out;
}

async function tallyCounts(text: string, plan: Plan): Promise<Counts> {
  const t = await tallyFixes(chunks(text, 1021), plan);
  const out: Counts = {};
  for (const col of t.sink.columns) {
    const n = col.pc.name;
    out[`${n}.tokens`] = col.tokens?.cells ?? 0;
    if (col.comma) {
      out[`${n}.point`] = col.point;
      out[`${n}.comma`] = col.comma.cells;
      for (const [v, c] of col.sentinels) out[`${n}.sentinel${v}`] = c.cells;
    }
    if (col.trim) out[`${n}.trim`] = col.trim.cells;
    if (col.dmy) {
      out[`${n}.a13`] = col.a13;
      out[`${n}.b13`] = col.b13;
      out[`${n}.dmy`] = col.dmy.cells;
      out[`${n}.mdy`] = col.mdy!.cells;
    }
  }
  return out;
}

describe("the fix tally read from bytes", () => {
  const plan = makePlan();
  for (const seed of [1, 2, 3, 4]) {
    test(`seed ${seed}: every count equals the rules applied to each field's text`, async () => {
      // 6,000 rows: more distinct values in code, dose and yield than the tally remembers
      const text = randomFile(seed, 6000);
      const want = await plainCounts(text, plan);
      const got = await tallyCounts(text, plan);
      expect(got).toEqual(want);
      // the oracle saw every kind of change the shortcuts must leave to the rules
      for (const k of [
        "rain.comma",
        "rain.sentinel-999",
        "dose.point",
        "soil.trim",
        "sown.dmy",
        "code.tokens",
      ])
        expect(want[k], k).toBeGreaterThan(0);
    });
  }
});
