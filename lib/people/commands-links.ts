import "server-only";
/**
 * One-time links by e-mail: an invitation (a new user sets a password) and a password reset.
 * Only the sha-256 of a link's token is stored; a link works once and expires.
 */
import { createHash, randomBytes } from "node:crypto";
import { and, eq, isNull } from "drizzle-orm";
import { z } from "zod";
import { getDb, type DbOrTx } from "@/db/client";
import { userTokens, users } from "@/db/schema";
import { hashPassword } from "@/lib/auth/password";
import { requireWithinLimits } from "@/lib/auth/rate-limit";
import { recordAudit } from "@/lib/core/audit";
import { CHECK_FIELDS, write } from "@/lib/core/write";
import { env } from "@/lib/env";
import { enqueueEmail, escapeHtml } from "@/lib/mail";
import { fail, ok, type Result } from "@/lib/result";
import { passwordSchema } from "./schemas";

const LIFETIME_MS = { invite: 7 * 24 * 3600_000, reset: 3600_000 } as const;

const hashToken = (t: string) => createHash("sha256").update(t, "utf8").digest("hex");

const INVITE_TEXT =
  "You have been given an account on Tributary, where data providers send batches for regression studies " +
  "and analysts review them. Choose your password here (the link works once, for 7 days):";
const RESET_TEXT =
  "Someone asked to reset the password of your Tributary account. If it was you, choose a new password here " +
  "(the link works once, for 1 hour). If it was not, ignore this e-mail; your password stays as it is.";

function linkEmail(invite: boolean, name: string, link: string) {
  const body = invite ? INVITE_TEXT : RESET_TEXT;
  const label = invite ? "Choose your password" : "Choose a new password";
  return {
    subject: invite ? "You are invited to Tributary" : "Reset your Tributary password",
    text: `Hello ${name},\n\n${body}\n\n${link}\n\n— Tributary`,
    html:
      `<!doctype html><html><body style="font-family:sans-serif;color:#12262E">` +
      `<p>Hello ${escapeHtml(name)},</p><p>${escapeHtml(body)}</p>` +
      `<p><a href="${escapeHtml(link)}" style="color:#1F6F78">${label}</a></p>` +
      `<p style="color:#6B6354">— Tributary</p></body></html>`,
  };
}

type LinkFor = {
  userId: number;
  kind: "invite" | "reset";
  email: string;
  name: string;
  actorId: number | null;
};

/** Creates a link for the user and queues its e-mail, in the caller's transaction. */
export async function issueUserLink(tx: DbOrTx, p: LinkFor): Promise<void> {
  const token = randomBytes(24).toString("base64url");
  const expiresAt = new Date(Date.now() + LIFETIME_MS[p.kind]);
  const [row] = await tx
    .insert(userTokens)
    .values({ userId: p.userId, kind: p.kind, tokenHash: hashToken(token), expiresAt })
    .$returningId();
  const link = `${env().APP_URL.replace(/\/$/, "")}/set-password/${token}`;
  const invite = p.kind === "invite";
  await enqueueEmail(tx, {
    dedupeKey: `user-link:${row?.id ?? token.slice(0, 12)}`,
    kind: invite ? "invitation" : "password-reset",
    to: p.email,
    ...linkEmail(invite, p.name, link),
  });
  await recordAudit(tx, {
    actorId: p.actorId,
    action: invite ? "user.invite_link" : "user.reset_link",
    objectType: "user",
    objectId: p.userId,
    after: { expiresInHours: LIFETIME_MS[p.kind] / 3600_000 },
  });
}

const resetEmailSchema = z
  .string()
  .trim()
  .toLowerCase()
  .pipe(z.email({ error: "Enter an e-mail address like name@example.org." }));

/**
 * Asks for a reset link. Answers the same whether or not the address has an account, so the
 * form does not tell who is registered; inactive accounts get nothing. Limited per client
 * address and per e-mail (counted whether or not it has an account, so the limit tells nothing
 * either), so nobody can flood an inbox with reset mails.
 */
export function requestPasswordReset(
  emailInput: unknown,
  meta: { ip: string } = { ip: "local" },
): Promise<Result<null>> {
  return write({
    name: "requestPasswordReset",
    actorId: null,
    may: "anyone",
    schema: resetEmailSchema,
    input: emailInput,
    invalid: (issues) => fail(CHECK_FIELDS, { email: [issues[0]?.message ?? "Enter an e-mail address."] }),
    run: async ({ tx, input: email }) => {
      const limits = [
        { name: "resetPerAddress", subject: meta.ip },
        { name: "resetPerTarget", subject: email },
      ] as const;
      await requireWithinLimits([...limits], "password-reset requests from here or for this address");
      const [u] = await tx
        .select({ id: users.id, name: users.name, active: users.active })
        .from(users)
        .where(eq(users.email, email));
      if (u?.active)
        await issueUserLink(tx, { userId: u.id, kind: "reset", email, name: u.name, actorId: null });
      return ok(null);
    },
  });
}

export type LinkInfo = { kind: "invite" | "reset"; email: string; name: string };

/** What a link is for, or null when it is unknown, used or expired. */
export async function describeLink(token: string): Promise<LinkInfo | null> {
  if (!/^[A-Za-z0-9_-]{20,64}$/.test(token)) return null;
  const [row] = await getDb()
    .select({
      kind: userTokens.kind,
      expiresAt: userTokens.expiresAt,
      usedAt: userTokens.usedAt,
      email: users.email,
      name: users.name,
      active: users.active,
    })
    .from(userTokens)
    .innerJoin(users, eq(users.id, userTokens.userId))
    .where(eq(userTokens.tokenHash, hashToken(token)));
  if (!row || row.usedAt || row.expiresAt.getTime() < Date.now() || !row.active) return null;
  return { kind: row.kind, email: row.email, name: row.name };
}

const setPasswordSchema = z
  .object({ password: passwordSchema, confirmPassword: z.string() })
  .refine((v) => v.password === v.confirmPassword, {
    path: ["confirmPassword"],
    message: "The two passwords differ.",
  });

/** Sets the password through a link: once, before it expires; older sessions end. */
export function setPasswordWithLink(token: string, input: unknown): Promise<Result<{ email: string }>> {
  return write({
    name: "setPasswordWithLink",
    // the link is the credential: its user is the actor of the audit row
    actorId: null,
    may: "anyone",
    schema: setPasswordSchema,
    input,
    run: async ({ tx, input: { password }, audit }) => {
      const [row] = await tx
        .select({
          id: userTokens.id,
          userId: userTokens.userId,
          kind: userTokens.kind,
          expiresAt: userTokens.expiresAt,
          email: users.email,
          active: users.active,
          sv: users.sessionVersion,
        })
        .from(userTokens)
        .innerJoin(users, eq(users.id, userTokens.userId))
        .where(and(eq(userTokens.tokenHash, hashToken(token)), isNull(userTokens.usedAt)))
        .for("update");
      if (!row || row.expiresAt.getTime() < Date.now() || !row.active) {
        return fail("This link has expired or was already used. Ask for a new one.", undefined, "not_found");
      }
      const passwordHash = await hashPassword(password);
      await tx.update(userTokens).set({ usedAt: new Date() }).where(eq(userTokens.id, row.id));
      await tx
        .update(users)
        .set({ passwordHash, sessionVersion: row.sv + 1, updatedAt: new Date() })
        .where(eq(users.id, row.userId));
      await audit({
        actorId: row.userId,
        action: row.kind === "invite" ? "user.invite_accepted" : "user.password_reset",
        objectType: "user",
        objectId: row.userId,
      });
      return ok({ email: row.email });
    },
  });
}
