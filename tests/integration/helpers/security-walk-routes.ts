/**
 * How the access walk calls each route handler of the README table: the path parameters,
 * query and body for the caller's own object (side A) or another's (side B). Each probe
 * prepares what it needs (throwaway objects for calls that change data) and returns the call,
 * so the test can take a data snapshot between the two; the call answers the HTTP status.
 */
import { NextRequest } from "next/server";
import type { Role, Scope } from "./security-walk-table";
import { actAs } from "./security-walk-request";
import { DEMO_STUDIES } from "@/lib/demo";
import {
  freshFarm,
  freshStudy,
  freshToken,
  freshUser,
  freshVersion,
  WALK_FINDING,
  type WalkWorld,
  type Side,
} from "./security-walk-world";

export type ProbeCtx = { w: WalkWorld; role: Role; scope: Scope; cookie: string };
export type Probe = {
  /** the answer depends on whose object is named (cells may say `own` / `other`) */
  scoped?: boolean;
  /** the call may change data: a refusal must leave every table as it was */
  mutates?: boolean;
  /** a success must change data (so `ok` / 2xx is a real success) */
  writes?: boolean;
  prepare(ctx: ProbeCtx): Promise<() => Promise<string>>;
};
export type RouteFn = (req: Request, ctx: { params: Promise<Record<string, unknown>> }) => Promise<Response>;

type Spec = {
  params?: Record<string, string | string[]>;
  query?: Record<string, string>;
  body?: unknown;
  form?: FormData;
  headers?: Record<string, string>;
  next?: boolean;
};

const CODE_OF: Record<number, string> = { 401: "unauthenticated", 403: "forbidden", 404: "not_found" };

/** Calls `fn` as the ctx's caller; refusals of the v1 API must carry the matching error code. */
export async function callRoute(
  fn: RouteFn,
  url: string,
  method: string,
  ctx: ProbeCtx,
  spec: Spec,
): Promise<string> {
  const path = url.replace(/\[(?:\.\.\.)?(\w+)\]/g, (_m, k: string) =>
    [spec.params?.[k] ?? `[${k}]`].flat().join("/"),
  );
  const full = new URL(`http://127.0.0.1:3410${path}`);
  for (const [k, v] of Object.entries(spec.query ?? {})) full.searchParams.set(k, v);
  const headers = new Headers(spec.headers);
  if (ctx.cookie) headers.set("cookie", ctx.cookie);
  let body: BodyInit | undefined;
  if (spec.form) body = spec.form;
  else if (spec.body !== undefined) {
    body = typeof spec.body === "string" ? spec.body : JSON.stringify(spec.body);
    if (!headers.has("content-type")) headers.set("content-type", "application/json");
  }
  const init = { method, headers, body };
  const req = spec.next ? new NextRequest(full, init) : new Request(full, init);
  actAs(ctx.cookie);
  const res = await fn(req, { params: Promise.resolve(spec.params ?? {}) });
  if (path.startsWith("/api/v1/") && CODE_OF[res.status]) {
    const json = (await res.json()) as { code?: string };
    if (json.code !== CODE_OF[res.status])
      throw new Error(`${method} ${path} answered ${res.status} with error code ${json.code}`);
  } else await res.body?.cancel();
  return String(res.status);
}

const side = (ctx: ProbeCtx): Side => (ctx.scope === "own" ? ctx.w.a : ctx.w.b);

/** A probe that calls the route with a spec built for the ctx. */
function route(build: (ctx: ProbeCtx) => Spec | Promise<Spec>, flags: Omit<Probe, "prepare"> = {}) {
  return (fn: RouteFn, url: string, method: string): Probe => ({
    ...flags,
    async prepare(ctx) {
      const spec = await build(ctx);
      return () => callRoute(fn, url, method, ctx, spec);
    },
  });
}

const plain = route(() => ({}));
const byStudy = route((c) => ({ params: { id: side(c).study.slug } }), { scoped: true });
const byPool = route((c) => ({ params: { slug: side(c).study.slug } }), { scoped: true });
const byVersion = route(
  (c) => ({ params: { id: side(c).ready.publicId, version: String(side(c).ready.version) } }),
  { scoped: true },
);

function csvForm(study: string): FormData {
  const form = new FormData();
  form.set("study", study);
  form.set("file", new File(["plot,yield_t_ha\n1,4.2\n"], "walk-upload.csv", { type: "text/csv" }));
  return form;
}

let n = 0;
const uploadFiles = () => [{ name: `walk-${++n}.csv`, size: 24, type: "text/csv", lastModified: Date.now() }];

/** Probes by "handler | call" as the README names them. */
export const ROUTE_PROBES: Record<string, (fn: RouteFn, url: string, method: string) => Probe> = {
  "GET /api/auth/[...nextauth] | read the session": route(() => ({
    params: { nextauth: ["session"] },
    next: true,
  })),
  "POST /api/auth/[...nextauth] | sign in without the form's CSRF token": route(
    (c) => ({
      params: { nextauth: ["callback", "credentials"] },
      next: true,
      headers: { "content-type": "application/x-www-form-urlencoded" },
      body: new URLSearchParams({
        email: c.w.users.providerA.email,
        password: "correct-horse-battery",
      }).toString(),
    }),
    { mutates: true },
  ),
  "GET /api/uploadthing | the upload route's configuration": route(() => ({ query: { slug: "batchFile" } })),
  "POST /api/uploadthing | prepare an upload to a study": route(
    (c) => ({
      query: { actionType: "upload", slug: "batchFile" },
      body: { files: uploadFiles(), input: { studySlug: side(c).study.slug } },
    }),
    { scoped: true, mutates: true },
  ),
  "POST /api/uploadthing | a callback with a forged signature": route(
    (c) => ({
      headers: { "uploadthing-hook": "callback", "x-uploadthing-signature": "hmac-sha256=" + "0".repeat(64) },
      body: {
        status: "uploaded",
        metadata: { userId: c.w.users.providerA.id, studyId: c.w.studyA.id, batchId: null, label: null },
        file: {
          key: "forged",
          name: "x.csv",
          size: 3,
          url: "http://127.0.0.1/f/forged",
          fileHash: "0",
          type: "text/csv",
          customId: null,
        },
      },
    }),
    { mutates: true },
  ),
  "GET /api/v1/openapi.json | —": plain,
  "GET /api/v1/me | —": plain,
  "GET /api/v1/studies | —": plain,
  "GET /api/v1/studies/[id] | —": byStudy,
  "GET /api/v1/studies/[id]/plan | —": byStudy,
  "GET /api/v1/batches | —": plain,
  "POST /api/v1/batches | upload a file to a study": route((c) => ({ form: csvForm(side(c).study.slug) }), {
    scoped: true,
    mutates: true,
    writes: true,
  }),
  "GET /api/v1/batches/[id] | —": route((c) => ({ params: { id: side(c).ready.publicId } }), {
    scoped: true,
  }),
  "GET /api/v1/queue | —": plain,
  "GET /api/v1/pool | —": plain,
  "GET /api/v1/pool/[slug] | —": byPool,
  "GET /api/v1/pool/[slug]/if-accepted | —": route(
    (c) => ({ params: { slug: side(c).study.slug }, query: { batch: side(c).ready.publicId, version: "1" } }),
    { scoped: true },
  ),
  "GET /api/v1/board | —": plain,
  "POST /api/v1/board/digest | —": route(() => ({}), { mutates: true, writes: true }),
  "GET /api/v1/audit | —": plain,
  "GET /api/v1/tokens | —": plain,
  "POST /api/v1/tokens | —": route(() => ({ body: { name: `walk ${++n}` } }), {
    mutates: true,
    writes: true,
  }),
  "DELETE /api/v1/tokens/[id] | —": route(
    async (c) => ({
      params: {
        id: String(
          await freshToken(
            c.w,
            c.role === "anonymous" ? c.w.users.providerA : c.w.callers[c.role],
            c.scope === "own",
          ),
        ),
      },
    }),
    { scoped: true, mutates: true, writes: true },
  ),
  "GET /api/v1/admin/users | —": plain,
  "POST /api/v1/admin/users | —": route(
    (c) => ({
      body: {
        email: `walk-new-${++n}-${process.pid}@f3a.test`,
        name: "Walk New",
        role: "analyst",
        organisationId: c.w.team.id,
        password: "long-enough-password",
      },
    }),
    { mutates: true, writes: true },
  ),
  "PATCH /api/v1/admin/users/[id] | —": route(
    async (c) => ({ params: { id: String((await freshUser(c.w, "analyst")).id) }, body: { active: false } }),
    { mutates: true, writes: true },
  ),
};

const changes = { mutates: true, writes: true } as const;
const scopedChange = { scoped: true, ...changes } as const;
const NEW_PASSWORD = { currentPassword: "correct-horse-battery", newPassword: "another-long-password" };

/** Probes of the routes that do a role's work (the same services as the pages' actions). */
export const WORK_PROBES: Record<string, (fn: RouteFn, url: string, method: string) => Probe> = {
  "POST /api/v1/batches/[id]/versions/[version]/decision | accept": route(async (c) => {
    const v = await freshVersion(c.w, c.scope === "own");
    return { params: { id: v.publicId, version: String(v.version) }, body: { decision: "accept" } };
  }, scopedChange),
  "POST /api/v1/batches/[id]/versions/[version]/finding-comments | a note on a finding": route(async (c) => {
    const v = await freshVersion(c.w, c.scope === "own", "with a finding");
    return {
      params: { id: v.publicId, version: String(v.version) },
      body: { code: WALK_FINDING, comment: "Walk note." },
    };
  }, scopedChange),
  "POST /api/v1/studies | —": route(
    () => ({ body: { slug: `walk-api-${process.pid}-${++n}`, title: "Walk API study", description: "" } }),
    changes,
  ),
  "POST /api/v1/studies/[id]/plan | a changed plan": route(async (c) => {
    const st = await freshStudy(c.w, c.scope === "own");
    return { params: { id: st.slug }, body: { plan: DEMO_STUDIES[1]!.plan, note: "walk" } };
  }, scopedChange),
  "POST /api/v1/studies/[id]/providers | admit a provider organisation": route(async (c) => {
    const st = await freshStudy(c.w, c.scope === "own");
    return { params: { id: st.slug }, body: { organisationId: await freshFarm() } };
  }, scopedChange),
  "DELETE /api/v1/studies/[id]/providers/[memberId] | remove the admitted farm": route(async (c) => {
    const st = await freshStudy(c.w, c.scope === "own");
    const farm = c.scope === "own" ? c.w.farmA.id : c.w.farmB.id;
    return { params: { id: st.slug, memberId: String(farm) } };
  }, scopedChange),
  "POST /api/v1/studies/[id]/analysts | assign an analyst": route(async (c) => {
    const st = await freshStudy(c.w, c.scope === "own");
    return { params: { id: st.slug }, body: { userId: (await freshUser(c.w, "analyst")).id } };
  }, scopedChange),
  "DELETE /api/v1/studies/[id]/analysts/[memberId] | unassign the assigned analyst": route(async (c) => {
    const st = await freshStudy(c.w, c.scope === "own");
    const analyst = c.scope === "own" ? c.w.users.analystA.id : c.w.users.analystB.id;
    return { params: { id: st.slug, memberId: String(analyst) } };
  }, scopedChange),
  "POST /api/v1/invitations | a provider": route(
    (c) => ({
      body: {
        email: `walk-api-invited-${process.pid}-${++n}@f3a.test`,
        name: "Walk Invited",
        role: "provider",
        organisationId: c.w.farmA.id,
      },
    }),
    changes,
  ),
  // as a throwaway user of the role: the change ends that user's sessions
  "POST /api/v1/me/password | own password": (fn, url, method) => ({
    ...changes,
    async prepare(ctx) {
      const cookie = ctx.role === "anonymous" ? "" : (await freshUser(ctx.w, ctx.role)).cookie;
      return () => callRoute(fn, url, method, { ...ctx, cookie }, { body: NEW_PASSWORD });
    },
  }),
};

/** Routes that read one batch version (`…/versions/[version]/<what>`) share one probe, also for ones added later. */
export function routeProbe(
  handler: string,
  call: string,
): ((fn: RouteFn, url: string, method: string) => Probe) | undefined {
  const exact = ROUTE_PROBES[`${handler} | ${call}`] ?? WORK_PROBES[`${handler} | ${call}`];
  if (exact) return exact;
  if (call === "—" && /^GET \/api\/v1\/batches\/\[id\]\/versions\/\[version\]\/[\w-]+$/.test(handler))
    return byVersion;
  if (call === "—" && /^GET \/api\/v1\/pool\/\[slug\]\/[\w-]+$/.test(handler)) return byPool;
  return undefined;
}
