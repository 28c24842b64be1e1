/**
 * The access walk: README.md's table "Who may call what" against the code. Every route
 * handler (each HTTP method of each app/api route file) and every server action (each export
 * of a "use server" file) must have a row, and every row must name one that exists; then each
 * row is called as each role and as anonymous — routes with a real next-auth session cookie,
 * actions with cookies()/headers() carrying it — in a world of two provider organisations and
 * two studies, so "another organisation's object" is real. A refused call that could change
 * data must leave every table as it was; an allowed one must really change it.
 */
import { afterAll, beforeAll, describe, expect, test, vi } from "vitest";

vi.mock("server-only", () => ({}));
vi.mock("next/cache", () => ({
  revalidatePath: () => undefined,
  revalidateTag: () => undefined,
  updateTag: () => undefined,
  refresh: () => undefined,
}));

import { getPool } from "@/db/client";
import { resetRateLimits } from "@/lib/auth/rate-limit";
import { ACTION_PROBES } from "./helpers/security-walk-actions";
import { installFakeNextHeaders } from "./helpers/security-walk-request";
import { routeProbe, type Probe, type RouteFn } from "./helpers/security-walk-routes";
import {
  inventory,
  readAccessTable,
  ROLES,
  type Handler,
  type Role,
  type Scope,
  type TableRow,
} from "./helpers/security-walk-table";
import {
  buildWalkWorld,
  dataSnapshot,
  startWalkFileStore,
  stopWalkFileStore,
  type WalkWorld,
} from "./helpers/security-walk-world";

const TABLE = readAccessTable();
let w: WalkWorld;
let handlers: Map<string, Handler>;
const modules = new Map<string, Record<string, unknown>>();

beforeAll(async () => {
  installFakeNextHeaders();
  await startWalkFileStore();
  w = await buildWalkWorld();
  handlers = new Map((await inventory()).map((h) => [h.name, h]));
});

afterAll(async () => {
  await stopWalkFileStore();
  await getPool().end();
});

/** The probe for a row, bound to the exported function it calls; undefined when the test has none. */
async function probeFor(row: TableRow): Promise<Probe | undefined> {
  const h = handlers.get(row.handler);
  if (!h) return undefined;
  const mod = modules.get(h.file) ?? ((await import(/* @vite-ignore */ h.file)) as Record<string, unknown>);
  modules.set(h.file, mod);
  const fn = mod[h.exportName];
  if (h.kind === "route") {
    const url = row.handler.slice(row.handler.indexOf(" ") + 1);
    return routeProbe(row.handler, row.call)?.(fn as RouteFn, url, h.exportName);
  }
  return ACTION_PROBES[`${row.handler} | ${row.call}`]?.(fn as never);
}

const SUCCESS = (answer: string) => answer === "ok" || /^2\d\d$/.test(answer);

describe("the table covers exactly the handlers there are", () => {
  test("every route method and server action on disk has a row", () => {
    const named = new Set(TABLE.map((r) => r.handler));
    const missing = [...handlers.keys()].filter((name) => !named.has(name));
    expect(missing, 'add a row to README.md\'s "Who may call what" for each of these').toEqual([]);
    // the inventory itself is not empty or half: both kinds, and next-auth's and the upload route's methods
    expect([...handlers.values()].filter((h) => h.kind === "route").length).toBeGreaterThanOrEqual(25);
    expect([...handlers.values()].filter((h) => h.kind === "action").length).toBeGreaterThanOrEqual(16);
    expect(handlers.has("POST /api/auth/[...nextauth]") && handlers.has("POST /api/uploadthing")).toBe(true);
  });

  test("every row names a route method or server action that exists, and has a way to be called", async () => {
    const unknown = TABLE.filter((r) => !handlers.has(r.handler)).map(
      (r) => `README line ${r.line}: ${r.handler}`,
    );
    expect(unknown, "these rows name no route method or server action").toEqual([]);
    const uncallable: string[] = [];
    for (const r of TABLE)
      if (!(await probeFor(r))) uncallable.push(`README line ${r.line}: ${r.handler} | ${r.call}`);
    expect(
      uncallable,
      "add a probe for these rows in tests/integration/helpers/security-walk-routes.ts or security-walk-actions.ts",
    ).toEqual([]);
  });

  test("a row per handler and call, no duplicates", () => {
    const keys = TABLE.map((r) => `${r.handler} | ${r.call}`);
    expect(keys.filter((k, i) => keys.indexOf(k) !== i)).toEqual([]);
  });
});

describe.each(TABLE.map((r) => [`${r.handler} (${r.call})`, r] as const))("%s", (_name, row) => {
  test.each(ROLES.map((r) => [r] as const))("as %s", async (role: Role) => {
    const probe = await probeFor(row);
    if (!probe) throw new Error(`README line ${row.line}: no probe for ${row.handler} | ${row.call}`);
    const cell = row.cells[role];
    if (cell.some((e) => e.scope) && !probe.scoped)
      throw new Error(
        `README line ${row.line}: ${row.handler} does not depend on whose object it is; write one answer.`,
      );
    // a plain answer on a scoped row holds for the caller's own object and for another's
    const calls: { scope: Scope; answer: string }[] = probe.scoped
      ? (["own", "other"] as const).map((scope) => ({
          scope,
          answer: (cell.find((e) => e.scope === scope) ?? cell.find((e) => !e.scope))?.answer ?? "",
        }))
      : [{ scope: "own", answer: cell[0]!.answer }];
    for (const expected of calls) {
      if (calls.some((c) => !c.answer))
        throw new Error(`README line ${row.line}: the ${role} cell names only one scope.`);
      await resetRateLimits();
      const run = await probe.prepare({ w, role, scope: expected.scope, cookie: w.cookies[role] });
      const before = probe.mutates ? await dataSnapshot() : "";
      const got = await run();
      expect(`${expected.scope}: ${got}`, `README line ${row.line}, ${role}, ${expected.scope} object`).toBe(
        `${expected.scope}: ${expected.answer}`,
      );
      if (!probe.mutates) continue;
      const after = await dataSnapshot();
      if (!SUCCESS(got)) expect(after, "a refused call changed data").toBe(before);
      else if (probe.writes) expect(after, "an allowed call changed nothing").not.toBe(before);
    }
  });
});
