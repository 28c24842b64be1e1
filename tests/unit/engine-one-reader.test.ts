/**
 * One reader for every path that reads a batch (issue 15): no application code parses CSV
 * with another parser, and the tokenizer is used through the engine's reading functions only.
 * Paths that read batches go through checkBatch / checkFile (the check, the server's worker,
 * the browser pre-check), draftPlan, rowsAtFault or csvRecords (the pool export).
 */
import fs from "node:fs";
import path from "node:path";
import { describe, expect, test } from "vitest";

const ROOTS = ["lib", "app", "components", "scripts", "db"];
/** files allowed to import a CSV parser other than the engine's (none in application code) */
const PARSER_ALLOW: string[] = [];

function sources(dir: string): string[] {
  if (!fs.existsSync(dir)) return [];
  return fs.readdirSync(dir, { withFileTypes: true }).flatMap((e) => {
    const p = path.join(dir, e.name);
    if (e.isDirectory()) return e.name === "node_modules" ? [] : sources(p);
    return /\.(ts|tsx|js|mjs|cjs)$/.test(e.name) ? [p] : [];
  });
}

const files = ROOTS.flatMap(sources);

describe("every batch-reading path uses the one reader", () => {
  test("no application file imports papaparse or another CSV parser", () => {
    expect(files.length).toBeGreaterThan(50);
    const offenders = files.filter(
      (f) =>
        !PARSER_ALLOW.includes(f) &&
        /from\s+["'](papaparse|csv-parse[^"']*|fast-csv|d3-dsv|neat-csv)["']|require\(["']papaparse["']\)/.test(
          fs.readFileSync(f, "utf8"),
        ),
    );
    expect(offenders).toEqual([]);
  });

  test("the tokenizer and readCsv are used only inside the engine (lib/readiness)", () => {
    const outside = files.filter(
      (f) =>
        !f.startsWith(`lib${path.sep}readiness${path.sep}`) &&
        /\bnew Tokenizer\(|\breadCsv\(|readiness\/(tokenizer|csv-reader)["']/.test(
          fs.readFileSync(f, "utf8"),
        ),
    );
    expect(outside).toEqual([]);
  });
});
