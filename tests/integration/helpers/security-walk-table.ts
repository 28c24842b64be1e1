/**
 * The README's access table ("## Who may call what") and the inventory it must match: every
 * route handler (each HTTP method exported by an app/api route file) and every server action
 * (each function exported by a "use server" file), found on disk.
 */
import { readdirSync, readFileSync } from "node:fs";
import path from "node:path";

export const ROLES = ["anonymous", "provider", "analyst", "lead", "admin"] as const;
export type Role = (typeof ROLES)[number];
export type Scope = "own" | "other";

/** One expected answer of a cell: an HTTP status or an action outcome, for one scope or for every object. */
export type Expect = { answer: string; scope?: Scope };
export type TableRow = { handler: string; call: string; cells: Record<Role, Expect[]>; line: number };

const ROOT = path.resolve(import.meta.dirname, "../../..");
const HTTP_METHODS = ["GET", "HEAD", "POST", "PUT", "PATCH", "DELETE", "OPTIONS"] as const;
const ANSWER = /^(\d{3}|ok|sign-in|forbidden|not found|conflict|invalid)$/;
const SECTION = "## Who may call what";

/** Parses one cell: `200`, or `200 own · 404 other`. Throws with the line when it cannot. */
export function parseCell(text: string, where: string): Expect[] {
  const parts = text.split("·").map((p) => p.trim());
  const out = parts.map((p) => {
    const m = /^(.*?)(?:\s+(own|other))?$/.exec(p)!;
    const answer = m[1]!.trim();
    if (!ANSWER.test(answer))
      throw new Error(
        `${where}: "${p}" is not an answer (a status like 200, or ok, sign-in, forbidden, not found, conflict, invalid).`,
      );
    return { answer, ...(m[2] ? { scope: m[2] as Scope } : {}) };
  });
  const scopes = out.map((e) => e.scope ?? "all");
  if (out.length > 1 && (scopes.includes("all") || new Set(scopes).size !== scopes.length)) {
    throw new Error(`${where}: write "<answer> own · <answer> other" when the answer depends on scope.`);
  }
  return out;
}

/** The rows of the README table, in order. */
export function readAccessTable(readme = readFileSync(path.join(ROOT, "README.md"), "utf8")): TableRow[] {
  const lines = readme.split("\n");
  const start = lines.findIndex((l) => l.trim() === SECTION);
  if (start < 0) throw new Error(`README.md has no "${SECTION}" section.`);
  const rows: TableRow[] = [];
  let header: string[] | null = null;
  for (let i = start + 1; i < lines.length && !lines[i]!.startsWith("## "); i++) {
    const line = lines[i]!.trim();
    if (!line.startsWith("|")) {
      if (header && rows.length > 0) break;
      continue;
    }
    const cells = line
      .slice(1, line.endsWith("|") ? -1 : undefined)
      .split("|")
      .map((c) => c.trim());
    if (!header) {
      header = cells;
      const want = ["handler", "call", ...ROLES];
      if (header.join("|") !== want.join("|"))
        throw new Error(`README line ${i + 1}: the table's columns must be ${want.join(" | ")}.`);
      continue;
    }
    if (cells.every((c) => /^:?-+:?$/.test(c))) continue;
    if (cells.length !== header.length)
      throw new Error(`README line ${i + 1}: ${cells.length} cells, the header has ${header.length}.`);
    const handler = /^`([^`]+)`$/.exec(cells[0]!)?.[1];
    if (!handler)
      throw new Error(`README line ${i + 1}: name the handler in backticks, e.g. \`GET /api/v1/me\`.`);
    const byRole = {} as Record<Role, Expect[]>;
    ROLES.forEach((r, k) => (byRole[r] = parseCell(cells[k + 2]!, `README line ${i + 1}, column ${r}`)));
    rows.push({ handler, call: cells[1]!, cells: byRole, line: i + 1 });
  }
  if (rows.length === 0) throw new Error(`README.md's "${SECTION}" section has no table rows.`);
  return rows;
}

function walk(dir: string): string[] {
  return readdirSync(dir, { withFileTypes: true }).flatMap((e) => {
    const p = path.join(dir, e.name);
    return e.isDirectory() ? walk(p) : [p];
  });
}

/** A file whose first statement (after comments) is the "use server" directive. */
function isServerActionFile(text: string): boolean {
  return /^["']use server["']/.test(text.replace(/^(?:\s+|\/\/[^\n]*|\/\*[\s\S]*?\*\/)*/, ""));
}

export type Handler = { name: string; file: string; exportName: string; kind: "route" | "action" };

/** `GET /api/v1/batches/[id]` for each method of each route file; `(portal)/x/actions.ts#fn` for each server action. */
export async function inventory(): Promise<Handler[]> {
  const app = path.join(ROOT, "app");
  const out: Handler[] = [];
  for (const file of walk(app).sort()) {
    const rel = path.relative(app, file).split(path.sep).join("/");
    if (/(^|\/)route\.tsx?$/.test(rel)) {
      const mod = (await import(/* @vite-ignore */ file)) as Record<string, unknown>;
      const url = "/" + rel.replace(/\/route\.tsx?$/, "");
      for (const m of HTTP_METHODS)
        if (typeof mod[m] === "function")
          out.push({ name: `${m} ${url}`, file, exportName: m, kind: "route" });
    } else if (/\.tsx?$/.test(rel) && isServerActionFile(readFileSync(file, "utf8"))) {
      const mod = (await import(/* @vite-ignore */ file)) as Record<string, unknown>;
      for (const [k, v] of Object.entries(mod))
        if (typeof v === "function") out.push({ name: `${rel}#${k}`, file, exportName: k, kind: "action" });
    }
  }
  return out;
}
