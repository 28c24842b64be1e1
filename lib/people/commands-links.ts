import "server-only";
/**
 * One-time links by e-mail: an invitation (a new user sets a password) and a password reset.
 * Only the sha-256 of a link's token is stored; a link works once and expires.
 */
import { createHash, randomBytes } from "node:crypto";
import { and, eq, isNull } from "drizzle-orm";
import { getDb } from "@/db/client";
import { userTokens, users } from "@/db/schema";
import { hashPassword } from "@/lib/auth/password";
import { env } from "@/lib/env";
import { enqueueEmail } from "@/lib/mail/outbox";
import { fail, fieldErrorsOf, ok, type Result } from "@/lib/result";
import { passwordSchema } from "@/lib/people/schemas";
import { recordAudit, type DbOrTx } from "@/lib/core/audit";
import { runService } from "@/lib/core/write";
import { z } from "zod";

const LIFETIME_MS = { invite: 7 * 24 * 3600_000, reset: 3600_000 } as const;

const hashToken = (t: string) => createHash("sha256").update(t, "utf8").digest("hex");
const esc = (s: string) => s.replace(/[&<>"']/g, (c) => ({ "&": "&amp;", "<": "&lt;", ">": "&gt;", '"': "&quot;", "'": "&#39;" })[c] as string);

/** Creates a link for the user and queues its e-mail, in the caller's transaction. */
export async function issueUserLink(tx: DbOrTx, p: { userId: number; kind: "invite" | "reset"; email: string; name: string; actorId: number | null }): Promise<void> {
  const token = randomBytes(24).toString("base64url");
  const [row] = await tx
    .insert(userTokens)
    .values({ userId: p.userId, kind: p.kind, tokenHash: hashToken(token), expiresAt: new Date(Date.now() + LIFETIME_MS[p.kind]) })
    .$returningId();
  const link = `${env().APP_URL.replace(/\/$/, "")}/set-password/${token}`;
  const invite = p.kind === "invite";
  const subject = invite ? "You are invited to Tributary" : "Reset your Tributary password";
  const body = invite
    ? `You have been given an account on Tributary, where data providers send batches for regression studies and analysts review them. Choose your password here (the link works once, for 7 days):`
    : `Someone asked to reset the password of your Tributary account. If it was you, choose a new password here (the link works once, for 1 hour). If it was not, ignore this e-mail; your password stays as it is.`;
  await enqueueEmail(tx, {
    dedupeKey: `user-link:${row?.id ?? token.slice(0, 12)}`,
    kind: invite ? "invitation" : "password-reset",
    to: p.email,
    subject,
    text: `Hello ${p.name},\n\n${body}\n\n${link}\n\n— Tributary`,
    html: `<!doctype html><html><body style="font-family:sans-serif;color:#12262E"><p>Hello ${esc(p.name)},</p><p>${esc(body)}</p><p><a href="${esc(link)}" style="color:#1F6F78">${invite ? "Choose your password" : "Choose a new password"}</a></p><p style="color:#6B6354">— Tributary</p></body></html>`,
  });
  await recordAudit(tx, { actorId: p.actorId, action: invite ? "user.invite_link" : "user.reset_link", objectType: "user", objectId: p.userId, after: { expiresInHours: LIFETIME_MS[p.kind] / 3600_000 } });
}

/**
 * Asks for a reset link. Answers the same whether or not the address has an account, so the
 * form does not tell who is registered; inactive accounts get nothing.
 */
export async function requestPasswordReset(emailInput: unknown): Promise<Result<null>> {
  return runService("requestPasswordReset", async () => {
    const email = z.string().trim().toLowerCase().pipe(z.email({ error: "Enter an e-mail address like name@example.org." })).safeParse(emailInput);
    if (!email.success) return fail("Check the highlighted fields.", { email: [email.error.issues[0]?.message ?? "Enter an e-mail address."] });
    await getDb().transaction(async (tx) => {
      const [u] = await tx.select({ id: users.id, name: users.name, active: users.active }).from(users).where(eq(users.email, email.data));
      if (u?.active) await issueUserLink(tx, { userId: u.id, kind: "reset", email: email.data, name: u.name, actorId: null });
    });
    return ok(null);
  });
}

export type LinkInfo = { kind: "invite" | "reset"; email: string; name: string };

/** What a link is for, or null when it is unknown, used or expired. */
export async function describeLink(token: string): Promise<LinkInfo | null> {
  if (!/^[A-Za-z0-9_-]{20,64}$/.test(token)) return null;
  const [row] = await getDb()
    .select({ kind: userTokens.kind, expiresAt: userTokens.expiresAt, usedAt: userTokens.usedAt, email: users.email, name: users.name, active: users.active })
    .from(userTokens)
    .innerJoin(users, eq(users.id, userTokens.userId))
    .where(eq(userTokens.tokenHash, hashToken(token)));
  if (!row || row.usedAt || row.expiresAt.getTime() < Date.now() || !row.active) return null;
  return { kind: row.kind, email: row.email, name: row.name };
}

const setPasswordSchema = z
  .object({ password: passwordSchema, confirmPassword: z.string() })
  .refine((v) => v.password === v.confirmPassword, { path: ["confirmPassword"], message: "The two passwords differ." });

/** Sets the password through a link: once, before it expires; older sessions end. */
export async function setPasswordWithLink(token: string, input: unknown): Promise<Result<{ email: string }>> {
  return runService("setPasswordWithLink", async () => {
    const parsed = setPasswordSchema.safeParse(input);
    if (!parsed.success) return fail("Check the highlighted fields.", fieldErrorsOf(parsed.error.issues));
    const hash = await hashPassword(parsed.data.password);
    return getDb().transaction(async (tx) => {
      const [row] = await tx
        .select({ id: userTokens.id, userId: userTokens.userId, kind: userTokens.kind, expiresAt: userTokens.expiresAt, email: users.email, active: users.active, sv: users.sessionVersion })
        .from(userTokens)
        .innerJoin(users, eq(users.id, userTokens.userId))
        .where(and(eq(userTokens.tokenHash, hashToken(token)), isNull(userTokens.usedAt)))
        .for("update");
      if (!row || row.expiresAt.getTime() < Date.now() || !row.active) {
        return fail<{ email: string }>("This link has expired or was already used. Ask for a new one.", undefined, "not_found");
      }
      await tx.update(userTokens).set({ usedAt: new Date() }).where(eq(userTokens.id, row.id));
      await tx.update(users).set({ passwordHash: hash, sessionVersion: row.sv + 1, updatedAt: new Date() }).where(eq(users.id, row.userId));
      await recordAudit(tx, { actorId: row.userId, action: row.kind === "invite" ? "user.invite_accepted" : "user.password_reset", objectType: "user", objectId: row.userId });
      return ok({ email: row.email });
    });
  });
}
