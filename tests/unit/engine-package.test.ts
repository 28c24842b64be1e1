/**
 * The engine as a package (lib/readiness/package.json): its exports are the public API, its bin
 * is `tributary-check`, the checkout links it as an npm workspace, and a lint rule keeps the
 * app on the public entries (eslint.config.js).
 */
import fs from "node:fs";
import path from "node:path";
import { ESLint } from "eslint";
import { describe, expect, test } from "vitest";

const ENGINE = path.resolve("lib/readiness");
const pkg = JSON.parse(fs.readFileSync(path.join(ENGINE, "package.json"), "utf8"));
const root = JSON.parse(fs.readFileSync("package.json", "utf8"));

describe("lib/readiness/package.json", () => {
  test("every export names a file of the package; the main entry is index.ts, Node helpers ./node", () => {
    expect(pkg.exports["."]).toBe("./index.ts");
    expect(pkg.exports["./node"]).toBe("./node.ts");
    for (const target of Object.values(pkg.exports) as string[])
      expect(fs.existsSync(path.join(ENGINE, target)), target).toBe(true);
  });

  test("the bin tributary-check is an executable Node script, linked by the root's workspaces", () => {
    const bin = path.join(ENGINE, pkg.bin["tributary-check"]);
    expect(fs.readFileSync(bin, "utf8").startsWith("#!/usr/bin/env node\n")).toBe(true);
    expect(fs.statSync(bin).mode & 0o111).not.toBe(0);
    expect(root.workspaces).toContain("lib/readiness");
    expect(root.scripts.check).toBe("node lib/readiness/bin/tributary-check.mjs");
  });

  test("every package the engine imports is among its dependencies", () => {
    const imported = new Set<string>();
    const walk = (dir: string) => {
      for (const e of fs.readdirSync(dir, { withFileTypes: true })) {
        const p = path.join(dir, e.name);
        if (e.isDirectory()) walk(p);
        else if (/\.(ts|mjs)$/.test(e.name)) {
          for (const m of fs
            .readFileSync(p, "utf8")
            .matchAll(/from "([^".][^"]*)"|import\("([^".][^"]*)"\)/g)) {
            const spec = (m[1] ?? m[2]) as string;
            if (!spec.startsWith("node:"))
              imported.add(
                spec.startsWith("@") ? spec.split("/").slice(0, 2).join("/") : spec.split("/")[0]!,
              );
          }
        }
      }
    };
    walk(ENGINE);
    expect([...imported].sort()).toEqual(Object.keys(pkg.dependencies).sort());
  });
});

describe("the app imports the engine through its public entries (eslint.config.js)", () => {
  const eslint = new ESLint({ cwd: process.cwd() });
  const lint = async (code: string, file: string) => {
    const [r] = await eslint.lintText(code, { filePath: path.resolve(file) });
    return r!.messages.filter((m) => m.ruleId === "no-restricted-imports").length;
  };

  test.each([
    { code: 'import { parsePlan } from "@/lib/readiness/plan";', file: "app/probe.ts", errors: 1 },
    { code: 'import { LeastSquares } from "../lib/readiness/stats";', file: "scripts/probe.ts", errors: 1 },
    {
      code: 'import type { Plan } from "@tributary/readiness/plan";',
      file: "components/probe.tsx",
      errors: 1,
    },
    { code: 'import { parsePlan } from "@/lib/readiness";', file: "app/probe.ts", errors: 0 },
    { code: 'import { checkFile } from "@/lib/readiness/node";', file: "lib/jobs/probe.ts", errors: 0 },
    {
      code: 'import { LeastSquares } from "@/lib/readiness/stats";',
      file: "tests/unit/probe.test.ts",
      errors: 0,
    },
  ])(
    "$file: $code → $errors error(s)",
    async ({ code, file, errors }) => {
      expect(await lint(`${code}\nexport const used = 1;\n`, file)).toBe(errors);
    },
    60_000,
  );
});
