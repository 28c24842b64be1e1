/**
 * The repository stands alone: no file of it reads or names a path outside the checkout — no
 * absolute path into someone's machine (the working directories of whoever wrote it), no
 * relative import or file access that climbs above the root, no document that is not in the
 * repository. A clone with nothing beside it must build, test and explain itself.
 *
 * The forbidden strings are assembled at run time, so that this file does not name them itself.
 */
import { execFileSync } from "node:child_process";
import fs from "node:fs";
import path from "node:path";
import { describe, expect, it } from "vitest";

const ROOT = path.resolve(import.meta.dirname, "../..");

/** Directories of a developer's machine that a repository never has reason to name. */
const MACHINE_DIRS = ["work", "root", "home", "Users", "mnt"];
const ABSOLUTE = new RegExp(`(^|[\\s"'\`(=:,[{])/(${MACHINE_DIRS.join("|")})/`);
/** The sibling folder the product's reference documents were handed over in. */
const SIBLING = new RegExp(
  ["\\.\\.", "shared\\b"].join("/") + "|(^|[^\\w./-])" + ["shared", "(reference|[A-Z]+\\.md)"].join("/"),
);
/** An upper-case document name such as README.md; it must be a file of the repository. */
const DOCUMENT = /(?<![\w/.-])([A-Z][A-Z0-9_-]*\.md)\b/g;
/** Lines that import, require, read or resolve a path (TypeScript, JavaScript, shell). */
const PATH_USE =
  /\bfrom\s+["'`]|\bimport\s*\(|\brequire\s*\(|\b(readFile|readFileSync|readdir|readdirSync|existsSync|createReadStream|statSync|open|opendir)\s*\(|\bpath\.(resolve|join)\s*\(|new URL\(|^\s*(source|\.|cd)\s|\$\(dirname/;
const QUOTED = /(["'`])((?:(?!\1).)*?\.\.\/(?:(?!\1).)*?)\1/g;

interface Offence {
  file: string;
  line: number;
  what: string;
  text: string;
}

/** The offences of one file's text (`file` relative to the root), given the repository's document names. */
function offencesOf(file: string, text: string, documents: Set<string>): Offence[] {
  const out: Offence[] = [];
  const dir = path.dirname(path.join(ROOT, file));
  text.split("\n").forEach((line, i) => {
    const at = (what: string) => out.push({ file, line: i + 1, what, text: line.trim().slice(0, 160) });
    if (ABSOLUTE.test(line)) at("an absolute path on a developer's machine");
    if (SIBLING.test(line)) at("the folder beside the checkout");
    for (const m of line.matchAll(DOCUMENT)) {
      if (!documents.has(m[1]!)) at(`${m[1]}, a document that is not in the repository`);
    }
    if (PATH_USE.test(line)) {
      for (const m of line.matchAll(QUOTED)) {
        const rel = m[2]!.replace(/^\$\{?[\w.]*\}?\//, "").split(/[\s$]/)[0]!;
        if (!rel.startsWith("..")) continue;
        const target = path.resolve(dir, rel);
        if (path.relative(ROOT, target).startsWith("..")) at(`${rel} leaves the checkout`);
      }
    }
  });
  return out;
}

function trackedFiles(): string[] {
  const out = execFileSync("git", ["ls-files", "-z", "--cached", "--others", "--exclude-standard"], {
    cwd: ROOT,
  });
  return out
    .toString("utf8")
    .split("\0")
    .filter((f) => f !== "" && f !== "package-lock.json");
}

function isBinary(buf: Buffer): boolean {
  return buf.subarray(0, 8000).includes(0);
}

describe("the repository stands alone", () => {
  it("no tracked file reads or names a path outside the checkout", () => {
    // regular files only: a symlinked node_modules (not matched by "node_modules/") is no file of ours
    const files = trackedFiles().filter((f) =>
      fs.statSync(path.join(ROOT, f), { throwIfNoEntry: false })?.isFile(),
    );
    expect(files.length).toBeGreaterThan(100);
    const documents = new Set(files.map((f) => path.basename(f)));
    const offences: string[] = [];
    for (const f of files) {
      const buf = fs.readFileSync(path.join(ROOT, f));
      if (isBinary(buf)) continue;
      for (const o of offencesOf(f, buf.toString("utf8"), documents))
        offences.push(`${o.file}:${o.line}: ${o.what}: ${o.text}`);
    }
    expect(offences).toEqual([]);
  });

  describe("what counts as an offence", () => {
    const docs = new Set(["README.md", "CHECKS.md"]);
    const flagged = (file: string, line: string) => offencesOf(file, line, docs).map((o) => o.what);
    const abs = (dir: string) => `/${dir}/someone/project`;
    const up = ["..", "..", ".."].join("/");

    it.each([
      [
        "tests/unit/a.test.ts",
        `const REF = path.resolve(import.meta.dirname, "${up}/${"sha"}red/reference");`,
      ],
      ["lib/a.ts", `import x from "${up}/elsewhere/x";`],
      ["scripts/a.sh", `source "${up}/elsewhere/lib.sh"`],
      ["lib/a.ts", `// see ${abs("work")}/notes`],
      ["lib/a.ts", `const p = "${abs("home")}/file";`],
      ["lib/a.ts", `fs.readFileSync("${abs("root")}/x")`],
      ["lib/a.ts", `// the rules are in ${"PRODUCT"}.md`],
      ["lib/a.md", `see \`${"sha"}red/${"CHECKS"}.md\``],
    ])("%s: %s", (file, line) => {
      expect(flagged(file, line).length).toBeGreaterThan(0);
    });

    it.each([
      ["tests/unit/a.test.ts", `const ROOT = path.resolve(import.meta.dirname, "../..");`],
      ["lib/a/b/c.ts", `import { x } from "../../y";`],
      ["tests/e2e/a.spec.ts", `const chromium = "/usr/bin/chromium";`],
      ["lib/a.ts", `const dir = "/tmp/tributary-x";`],
      ["lib/a.ts", `fetch(\`\${base}/api/v1/home/summary\`)`],
      ["lib/a.ts", `const url = "https://example.org/home/x";`],
      ["tests/unit/a.test.ts", `{ name: "${up}/etc/passwd", label: "hostile" }`],
      ["lib/a.ts", `// specified in lib/readiness/CHECKS.md, see README.md`],
      ["lib/a.ts", `import { x } from "@/components/shared/button";`],
    ])("not %s: %s", (file, line) => {
      expect(flagged(file, line)).toEqual([]);
    });
  });
});
