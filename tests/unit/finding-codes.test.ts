/**
 * The finding codes have one list (FINDING_CODES, lib/readiness/codes.ts). This test holds the
 * specification's catalogue (lib/readiness/CHECKS.md) and the engine's source to it: the
 * catalogue lists exactly the codes of the table with the same severities, and every code the
 * engine passes to `finding(` is in the table.
 */
import fs from "node:fs";
import path from "node:path";
import ts from "typescript";
import { describe, expect, it } from "vitest";
import { FINDING_CODES, isFindingCode } from "@/lib/readiness/codes";
import { ROW_FAULT_CODES } from "@/lib/readiness/faults";

const ROOT = path.resolve(import.meta.dirname, "../..");
const ENGINE = path.join(ROOT, "lib/readiness");
const SEVERITIES = ["blocker", "warning", "note"] as const;

/** Catalogue rows of CHECKS.md: `| \`code\` | severities | …`. */
function catalogueOf(markdown: string): Map<string, string[]> {
  const out = new Map<string, string[]>();
  for (const line of markdown.split("\n")) {
    const m = /^\|\s*`([a-z]+\.[a-z-]+)`\s*\|([^|]*)\|/.exec(line);
    if (!m) continue;
    const words = (m[2] ?? "").toLowerCase();
    out.set(
      m[1]!,
      SEVERITIES.filter((s) => words.includes(s)),
    );
  }
  return out;
}

function engineFiles(dir: string): string[] {
  return fs.readdirSync(dir, { withFileTypes: true }).flatMap((e) => {
    const p = path.join(dir, e.name);
    if (e.isDirectory()) return engineFiles(p);
    return /\.ts$/.test(e.name) && !e.name.endsWith(".d.ts") ? [p] : [];
  });
}

/** The string literals of the first argument of every `finding(…)` call; non-literal arguments as errors. */
function codesPassedToFinding(file: string, text: string): { codes: string[]; problems: string[] } {
  const src = ts.createSourceFile(file, text, ts.ScriptTarget.Latest, true);
  const codes: string[] = [];
  const problems: string[] = [];
  const literals = (e: ts.Expression): string[] | null => {
    if (ts.isStringLiteral(e) || ts.isNoSubstitutionTemplateLiteral(e)) return [e.text];
    if (ts.isParenthesizedExpression(e)) return literals(e.expression);
    if (ts.isConditionalExpression(e)) {
      const a = literals(e.whenTrue);
      const b = literals(e.whenFalse);
      return a && b ? [...a, ...b] : null;
    }
    return null;
  };
  const visit = (node: ts.Node): void => {
    if (ts.isCallExpression(node) && ts.isIdentifier(node.expression) && node.expression.text === "finding") {
      const first = node.arguments[0];
      const found = first ? literals(first) : null;
      const at = `${path.relative(ROOT, file)}:${src.getLineAndCharacterOfPosition(node.getStart()).line + 1}`;
      if (found) codes.push(...found);
      else
        problems.push(`${at}: the code passed to finding() is not a string literal, so it cannot be checked`);
    }
    ts.forEachChild(node, visit);
  };
  visit(src);
  return { codes, problems };
}

describe("finding codes", () => {
  const table = Object.keys(FINDING_CODES);
  const catalogue = catalogueOf(fs.readFileSync(path.join(ENGINE, "CHECKS.md"), "utf8"));

  it("CHECKS.md's catalogue lists exactly the codes of FINDING_CODES", () => {
    expect([...catalogue.keys()].sort()).toEqual([...table].sort());
  });

  it("CHECKS.md gives each code the severities of the table", () => {
    const differ = table.filter((code) => {
      const doc = catalogue.get(code) ?? [];
      const own = [...FINDING_CODES[code as keyof typeof FINDING_CODES].severities];
      return doc.slice().sort().join() !== own.sort().join();
    });
    expect(differ).toEqual([]);
  });

  it("every code the engine passes to finding() is in the table, and the table has no dead code", () => {
    const emitted = new Set<string>();
    const problems: string[] = [];
    for (const file of engineFiles(ENGINE)) {
      const r = codesPassedToFinding(file, fs.readFileSync(file, "utf8"));
      r.codes.forEach((c) => emitted.add(c));
      problems.push(...r.problems);
    }
    expect(problems).toEqual([]);
    expect(emitted.size).toBeGreaterThan(30);
    expect([...emitted].filter((c) => !isFindingCode(c))).toEqual([]);
    // the pool questions are computed outside the single-batch engine and may land later
    const unused = table.filter(
      (c) => !emitted.has(c) && FINDING_CODES[c as keyof typeof FINDING_CODES].group !== "pool questions",
    );
    expect(unused).toEqual([]);
  });

  it("the scan of finding() calls sees literals, conditionals, and flags anything else", () => {
    const r = codesPassedToFinding(
      "x.ts",
      'finding("a.b", "note"); finding(x ? "c.d" : ("e.f"), "note"); finding(code, "note"); other("g.h");',
    );
    expect(r.codes).toEqual(["a.b", "c.d", "e.f"]);
    expect(r.problems).toHaveLength(1);
  });

  it("the catalogue reader takes codes and severities from table rows only", () => {
    const md =
      "| code | severity |\n|---|---|\n| `a.b` | warning |\n| `c.d-e` | note, warning, blocker |\nsee `f.g` |";
    expect([...catalogueOf(md)]).toEqual([
      ["a.b", ["warning"]],
      ["c.d-e", ["blocker", "warning", "note"]],
    ]);
  });

  it("every row-fault code is a finding code", () => {
    expect(ROW_FAULT_CODES.filter((c) => !isFindingCode(c))).toEqual([]);
  });
});
