import "server-only";
import { and, count, eq, ne } from "drizzle-orm";
import { getDb } from "@/db/client";
import { organisations, users, type UserRole } from "@/db/schema";
import { hashPassword, verifyPassword } from "@/lib/auth/password";
import { can, INVITABLE_ROLES } from "@/lib/auth/permissions";
import { checkSignInAllowed, clearSignInFailures, recordSignInFailure } from "@/lib/auth/rate-limit";
import { AppError } from "@/lib/errors";
import { fail, fieldErrorsOf, ok, type Result } from "@/lib/result";
import { changePasswordSchema, createUserSchema, updateUserSchema, userIdSchema } from "@/lib/people/schemas";
import { loadActor } from "@/lib/core/actor";
import { recordAudit, type Tx } from "@/lib/core/audit";
import { isDuplicateKey, runService } from "@/lib/core/write";
import { issueUserLink } from "./commands-links";

export type UserRecord = {
  id: number;
  email: string;
  name: string;
  role: UserRole;
  organisationId: number | null;
  active: boolean;
};

const EMAIL_TAKEN = "An account with this e-mail already exists.";

async function lockUser(tx: Tx, userId: number) {
  const rows = await tx
    .select({
      id: users.id,
      email: users.email,
      name: users.name,
      role: users.role,
      organisationId: users.organisationId,
      organisationKind: organisations.kind,
      active: users.active,
      sessionVersion: users.sessionVersion,
    })
    .from(users)
    .leftJoin(organisations, eq(organisations.id, users.organisationId))
    .where(eq(users.id, userId))
    .for("update")
    .limit(1);
  const row = rows[0];
  if (!row) throw new AppError("not_found", "There is no such user.");
  return row;
}

/** The installation must keep one active admin, or nobody could manage users again. */
async function assertAnotherActiveAdmin(tx: Tx, exceptUserId: number): Promise<void> {
  const rows = await tx
    .select({ n: count() })
    .from(users)
    .where(and(eq(users.role, "admin"), eq(users.active, true), ne(users.id, exceptUserId)));
  if (Number(rows[0]?.n ?? 0) === 0) throw new AppError("conflict", "This is the last active admin; make another user admin first.");
}

function record(row: { id: number; email: string; name: string; role: UserRole; organisationId: number | null; active: boolean }): UserRecord {
  return { id: row.id, email: row.email, name: row.name, role: row.role, organisationId: row.organisationId, active: row.active };
}

/**
 * Creates a user, with a password or (without one) invited by e-mail to set their own. Admins (user.manage) create any role; leads (user.invite)
 * create providers and analysts. A provider belongs to a provider organisation; other roles
 * to a team organisation or none. A taken e-mail is a field error.
 */
export async function createUser(actorId: number, input: unknown): Promise<Result<UserRecord>> {
  return runService("createUser", async () => {
    const parsed = createUserSchema.safeParse(input);
    if (!parsed.success) return fail("Check the highlighted fields.", fieldErrorsOf(parsed.error.issues));
    const data = parsed.data;

    const db = getDb();
    const actor = await loadActor(db, actorId);
    const mayCreate = can(actor.role, "user.manage") || (can(actor.role, "user.invite") && INVITABLE_ROLES.includes(data.role));
    if (!mayCreate) {
      if (can(actor.role, "user.invite")) return fail("You can invite providers and analysts only.", { role: ["Choose provider or analyst."] }, "forbidden");
      throw new AppError("forbidden");
    }
    const passwordHash = data.password ? await hashPassword(data.password) : null;

    try {
      return await db.transaction(async (tx) => {
        const taken = await tx.select({ id: users.id }).from(users).where(eq(users.email, data.email)).limit(1);
        if (taken.length > 0) return fail<UserRecord>("Check the highlighted fields.", { email: [EMAIL_TAKEN] }, "conflict");

        if (data.organisationId != null) {
          const org = await tx.select({ kind: organisations.kind }).from(organisations).where(eq(organisations.id, data.organisationId)).limit(1);
          if (!org[0]) return fail<UserRecord>("Check the highlighted fields.", { organisationId: ["There is no such organisation."] });
          if (data.role === "provider" && org[0].kind !== "provider")
            return fail<UserRecord>("Check the highlighted fields.", { organisationId: ["A provider belongs to a provider organisation (a farm, an installer …)."] });
          if (data.role !== "provider" && org[0].kind !== "team")
            return fail<UserRecord>("Check the highlighted fields.", { organisationId: ["Analysts, leads and admins belong to a team organisation, or to none."] });
        } else if (data.role === "provider") {
          return fail<UserRecord>("Check the highlighted fields.", { organisationId: ["Choose the provider organisation this user sends batches for."] });
        }

        const [created] = await tx
          .insert(users)
          .values({ email: data.email, name: data.name, role: data.role, organisationId: data.organisationId, passwordHash, active: true })
          .$returningId();
        if (!created) throw new Error("insert into users returned no id");
        const rec: UserRecord = { id: created.id, email: data.email, name: data.name, role: data.role, organisationId: data.organisationId, active: true };
        await recordAudit(tx, { actorId: actor.id, action: data.password ? "user.create" : "user.invite", objectType: "user", objectId: rec.id, before: null, after: rec });
        if (!data.password) await issueUserLink(tx, { userId: rec.id, kind: "invite", email: rec.email, name: rec.name, actorId: actor.id });
        return ok(rec);
      });
    } catch (e) {
      // two admins creating the same e-mail at once: the unique key decides
      if (isDuplicateKey(e)) return fail("Check the highlighted fields.", { email: [EMAIL_TAKEN] }, "conflict");
      throw e;
    }
  });
}

type LockedUser = Awaited<ReturnType<typeof lockUser>>;

async function applyRoleChange(tx: Tx, actorId: number, target: LockedUser, role: UserRole): Promise<Result<LockedUser>> {
  if (target.role === role) return ok(target);
  if (actorId === target.id) return fail("You cannot change your own role; ask another admin.", undefined, "conflict");
  if ((target.role === "provider") !== (role === "provider")) {
    return fail(
      target.role === "provider"
        ? "A provider belongs to a provider organisation; create a separate team account for this person instead."
        : "A provider must belong to a provider organisation; create a separate provider account instead.",
      { role: ["Not possible for this user's organisation."] },
      "conflict",
    );
  }
  if (target.role === "admin" && target.active) await assertAnotherActiveAdmin(tx, target.id);
  await tx.update(users).set({ role, updatedAt: new Date() }).where(eq(users.id, target.id));
  await recordAudit(tx, { actorId, action: "user.role_change", objectType: "user", objectId: target.id, before: { role: target.role }, after: { role } });
  return ok({ ...target, role });
}

async function applyActiveChange(tx: Tx, actorId: number, target: LockedUser, active: boolean): Promise<Result<LockedUser>> {
  if (target.active === active) return ok(target);
  if (actorId === target.id && !active) return fail("You cannot deactivate your own account.", undefined, "conflict");
  if (!active && target.role === "admin") await assertAnotherActiveAdmin(tx, target.id);
  // deactivation bumps session_version: open sessions end at their next request
  const sessionVersion = active ? target.sessionVersion : target.sessionVersion + 1;
  await tx.update(users).set({ active, sessionVersion, updatedAt: new Date() }).where(eq(users.id, target.id));
  await recordAudit(tx, {
    actorId,
    action: active ? "user.reactivate" : "user.deactivate",
    objectType: "user",
    objectId: target.id,
    before: { active: target.active },
    after: { active },
  });
  return ok({ ...target, active, sessionVersion });
}

/**
 * Changes another user's role and/or active flag (user.manage) in one transaction, with an
 * audit row per change. Deactivation ends the user's open sessions. Provider ↔ team roles
 * cannot be swapped in place, and the last active admin stays an active admin.
 */
export async function updateUser(actorId: number, userId: number, input: unknown): Promise<Result<UserRecord>> {
  return runService("updateUser", async () => {
    const id = userIdSchema.safeParse(userId);
    if (!id.success) return fail("There is no such user.", undefined, "not_found");
    const parsed = updateUserSchema.safeParse(input);
    if (!parsed.success) return fail("Check the highlighted fields.", fieldErrorsOf(parsed.error.issues));

    return getDb().transaction(async (tx) => {
      const actor = await loadActor(tx, actorId, "user.manage");
      let target = await lockUser(tx, id.data);
      if (parsed.data.role !== undefined) {
        const r = await applyRoleChange(tx, actor.id, target, parsed.data.role);
        if (!r.ok) throw new AppError(r.code ?? "invalid", r.message, { fieldErrors: r.fieldErrors });
        target = r.data;
      }
      if (parsed.data.active !== undefined) {
        const r = await applyActiveChange(tx, actor.id, target, parsed.data.active);
        // throwing rolls back a role change made just before
        if (!r.ok) throw new AppError(r.code ?? "invalid", r.message, { fieldErrors: r.fieldErrors });
        target = r.data;
      }
      return ok(record(target));
    });
  });
}

/** Changes another user's role (user.manage); see updateUser. */
export function changeRole(actorId: number, userId: number, role: UserRole): Promise<Result<UserRecord>> {
  return updateUser(actorId, userId, { role });
}

/**
 * Activates or deactivates another user (user.manage). Deactivation bumps session_version,
 * so the user's open sessions stop working at their next request.
 */
export function setActive(actorId: number, userId: number, active: boolean): Promise<Result<UserRecord>> {
  return updateUser(actorId, userId, { active });
}

/**
 * Changes the actor's own password after checking the current one. Bumps session_version:
 * every session opened before, this one included, ends; the user signs in again with the
 * new password.
 */
export async function changeOwnPassword(
  actorId: number,
  currentPassword: string,
  newPassword: string,
  confirmPassword?: string,
): Promise<Result<{ sessionVersion: number }>> {
  return runService("changeOwnPassword", async () => {
    const parsed = changePasswordSchema.safeParse({ currentPassword, newPassword, confirmPassword });
    if (!parsed.success) return fail("Check the highlighted fields.", fieldErrorsOf(parsed.error.issues));

    const db = getDb();
    await loadActor(db, actorId);
    // an unattended open session must not become a way to guess the password
    const throttleKey = `user:${actorId}`;
    const gate = checkSignInAllowed(throttleKey, "password-change");
    if (!gate.allowed) {
      return fail(`Too many wrong current passwords. Try again in ${Math.ceil(gate.retryAfterSeconds / 60)} minutes.`, undefined, "conflict");
    }
    const rows = await db.select({ passwordHash: users.passwordHash }).from(users).where(eq(users.id, actorId)).limit(1);
    if (!(await verifyPassword(parsed.data.currentPassword, rows[0]?.passwordHash))) {
      recordSignInFailure(throttleKey, "password-change");
      return fail("Check the highlighted fields.", { currentPassword: ["That is not your current password."] });
    }
    clearSignInFailures(throttleKey, "password-change");
    const hash = await hashPassword(parsed.data.newPassword);

    return db.transaction(async (tx) => {
      const target = await lockUser(tx, actorId);
      const next = target.sessionVersion + 1;
      await tx.update(users).set({ passwordHash: hash, sessionVersion: next, updatedAt: new Date() }).where(eq(users.id, actorId));
      await recordAudit(tx, {
        actorId,
        action: "user.password_change",
        objectType: "user",
        objectId: actorId,
        before: { sessionVersion: target.sessionVersion },
        after: { sessionVersion: next },
      });
      return ok({ sessionVersion: next });
    });
  });
}
