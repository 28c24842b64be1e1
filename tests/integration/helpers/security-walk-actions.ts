/**
 * How the access walk calls each server action of the README table. An action is called as
 * the browser's POST would reach it: the exported function, with cookies()/headers() carrying
 * the caller's session (helpers/security-request.ts). Its outcome is `ok` (a successful
 * Result, or a redirect onward), `sign-in` (a redirect to /sign-in, or the code
 * unauthenticated), `forbidden`, `not found`, `conflict` or `invalid` (other codes).
 */
import { desc, eq } from "drizzle-orm";
import { getDb } from "@/db/client";
import { emailOutbox } from "@/db/schema";
import { DEMO_STUDIES } from "@/lib/demo";
import { requestPasswordReset } from "@/lib/people/commands-links";
import { actAs, redirectTarget } from "./security-walk-request";
import type { Probe, ProbeCtx } from "./security-walk-routes";
import { freshFarm, freshStudy, freshToken, freshUser, freshVersion } from "./security-walk-world";

type Action = (...args: never[]) => Promise<unknown>;
type Prepared = { args: unknown[]; cookie?: string };

/** The outcome of calling an action, in the table's words. */
export async function actionOutcome(run: () => Promise<unknown>): Promise<string> {
  try {
    const r = (await run()) as { ok?: boolean; code?: string } | null;
    if (r?.ok === true) return "ok";
    if (r?.ok === false)
      return r.code === "unauthenticated"
        ? "sign-in"
        : r.code === "not_found"
          ? "not found"
          : (r.code ?? "invalid");
    throw new Error(`the action answered neither a Result nor a redirect: ${JSON.stringify(r)}`);
  } catch (e) {
    const to = redirectTarget(e);
    if (to === null) throw e;
    return to.startsWith("/sign-in") ? "sign-in" : "ok";
  }
}

function action(build: (ctx: ProbeCtx) => Prepared | Promise<Prepared>, flags: Omit<Probe, "prepare"> = {}) {
  return (fn: Action): Probe => ({
    mutates: true,
    writes: true,
    ...flags,
    async prepare(ctx) {
      const p = await build(ctx);
      return () => {
        actAs(p.cookie ?? ctx.cookie);
        return actionOutcome(() => (fn as (...a: unknown[]) => Promise<unknown>)(...p.args));
      };
    },
  });
}

const form = (fields: Record<string, string>) => {
  const f = new FormData();
  for (const [k, v] of Object.entries(fields)) f.set(k, v);
  return f;
};

let n = 0;
const unique = () => `${process.pid}-${++n}`;

/** The token of the newest reset link e-mailed to `email` (the link's last path segment). */
async function linkTokenFor(email: string): Promise<string> {
  const [m] = await getDb()
    .select({ text: emailOutbox.textBody })
    .from(emailOutbox)
    .where(eq(emailOutbox.toAddress, email))
    .orderBy(desc(emailOutbox.id))
    .limit(1);
  const token = /\/set-password\/([A-Za-z0-9_-]+)/.exec(m?.text ?? "")?.[1];
  if (!token) throw new Error(`no reset link was e-mailed to ${email}`);
  return token;
}

/** Throwaway study for the row: side A's farm and analyst belong to it when own. */
const study = (c: ProbeCtx) => freshStudy(c.w, c.scope === "own");

/** Probes by "file#export | call" as the README names them. */
export const ACTION_PROBES: Record<string, (fn: Action) => Probe> = {
  "(auth)/link-actions.ts#requestResetAction | an account's e-mail": action(async (c) => ({
    args: [(await freshUser(c.w, "provider")).email],
  })),
  "(auth)/link-actions.ts#setPasswordAction | the link from the e-mail": action(async (c) => {
    const u = await freshUser(c.w, "analyst");
    const r = await requestPasswordReset(u.email);
    if (!r.ok) throw new Error(r.message);
    return { args: [await linkTokenFor(u.email), "a-new-long-password", "a-new-long-password"] };
  }),
  "(auth)/link-actions.ts#setPasswordAction | a made-up link": action(() => ({
    args: ["A".repeat(32), "a-new-long-password", "a-new-long-password"],
  })),
  "(portal)/admin/jobs/actions.ts#retryJobAction | a failed check": action(async (c) => ({
    args: [(await freshVersion(c.w, true, "failed")).jobId],
  })),
  "(portal)/admin/users/actions.ts#createUserAction | a provider with a password": action((c) => ({
    args: [
      null,
      form({
        email: `walk-made-${unique()}@f3a.test`,
        name: "Walk Made",
        role: "provider",
        organisationId: String(c.w.farmA.id),
        password: "long-enough-password",
      }),
    ],
  })),
  "(portal)/admin/users/actions.ts#changeRoleAction | analyst to lead": action(async (c) => ({
    args: [(await freshUser(c.w, "analyst")).id, "lead"],
  })),
  "(portal)/admin/users/actions.ts#setActiveAction | deactivate": action(async (c) => ({
    args: [(await freshUser(c.w, "analyst")).id, false],
  })),
  "(portal)/batches/[id]/actions.ts#decideAction | accept": action(
    async (c) => {
      const v = await freshVersion(c.w, c.scope === "own");
      return { args: [v.publicId, v.version, { decision: "accept" }] };
    },
    { scoped: true },
  ),
  "(portal)/invite/actions.ts#inviteAction | a provider": action((c) => ({
    args: [
      {
        email: `walk-invited-${unique()}@f3a.test`,
        name: "Walk Invited",
        role: "provider",
        organisationId: String(c.w.farmA.id),
      },
    ],
  })),
  // as a throwaway user of the role: the change ends that user's sessions
  "(portal)/settings/actions.ts#changePasswordAction | own password": action(async (c) => {
    if (c.role === "anonymous")
      return {
        args: [
          null,
          form({
            currentPassword: "correct-horse-battery",
            newPassword: "another-long-password",
            confirmPassword: "another-long-password",
          }),
        ],
      };
    const u = await freshUser(c.w, c.role);
    return {
      cookie: u.cookie,
      args: [
        null,
        form({
          currentPassword: "correct-horse-battery",
          newPassword: "another-long-password",
          confirmPassword: "another-long-password",
        }),
      ],
    };
  }),
  "(portal)/settings/token-actions.ts#createTokenAction | —": action(() => ({ args: [`walk ${unique()}`] })),
  "(portal)/settings/token-actions.ts#revokeTokenAction | —": action(
    async (c) => ({
      args: [
        await freshToken(
          c.w,
          c.role === "anonymous" ? c.w.users.providerA : c.w.callers[c.role],
          c.scope === "own",
        ),
      ],
    }),
    { scoped: true },
  ),
  "(portal)/studies/[slug]/actions.ts#updateStudyAction | close the study": action(
    async (c) => ({ args: [(await study(c)).slug, { status: "closed" }] }),
    { scoped: true },
  ),
  "(portal)/studies/[slug]/actions.ts#addMemberAction | admit a provider organisation": action(
    async (c) => ({ args: [(await study(c)).slug, "provider", String(await freshFarm())] }),
    {
      scoped: true,
    },
  ),
  "(portal)/studies/[slug]/actions.ts#removeMemberAction | remove the admitted farm": action(
    async (c) => ({
      args: [(await study(c)).slug, "provider", c.scope === "own" ? c.w.farmA.id : c.w.farmB.id],
    }),
    { scoped: true },
  ),
  "(portal)/studies/[slug]/plan/actions.ts#publishPlanAction | a changed plan": action(
    async (c) => ({ args: [(await study(c)).slug, DEMO_STUDIES[1]!.plan, "walk"] }),
    { scoped: true },
  ),
  "(portal)/studies/actions.ts#createStudyAction | —": action(() => ({
    args: [
      null,
      form({
        slug: `walk-new-${unique()}`,
        title: "Walk new study",
        description: "",
        teamOrganisationId: "",
      }),
    ],
  })),
};
