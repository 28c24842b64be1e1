import "server-only";
import { and, count, eq, ne } from "drizzle-orm";
import type { Tx } from "@/db/client";
import { organisations, users, type UserRole } from "@/db/schema";
import { hashPassword, verifyPassword } from "@/lib/auth/password";
import { can, INVITABLE_ROLES } from "@/lib/auth/permissions";
import { clearLimit, countEvent, peekLimit, requireWithinLimits, waitText } from "@/lib/auth/rate-limit";
import { CHECK_FIELDS, refuse, write, type Audit } from "@/lib/core/write";
import { AppError } from "@/lib/errors";
import { fail, fieldErrorsOf, ok, type Result } from "@/lib/result";
import { z } from "zod";
import { issueUserLink } from "./commands-links";
import { changePasswordSchema, createUserSchema, updateUserSchema, userIdSchema } from "./schemas";

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
      active: users.active,
      sessionVersion: users.sessionVersion,
    })
    .from(users)
    .where(eq(users.id, userId))
    .for("update")
    .limit(1);
  const row = rows[0];
  if (!row) throw new AppError("not_found", "There is no such user.");
  return row;
}

type LockedUser = Awaited<ReturnType<typeof lockUser>>;

/** The installation must keep one active admin, or nobody could manage users again. */
async function assertAnotherActiveAdmin(tx: Tx, exceptUserId: number): Promise<void> {
  const rows = await tx
    .select({ n: count() })
    .from(users)
    .where(and(eq(users.role, "admin"), eq(users.active, true), ne(users.id, exceptUserId)));
  if (Number(rows[0]?.n ?? 0) === 0) {
    throw new AppError("conflict", "This is the last active admin; make another user admin first.");
  }
}

function record(row: UserRecord): UserRecord {
  const { id, email, name, role, organisationId, active } = row;
  return { id, email, name, role, organisationId, active };
}

/** Why the organisation does not fit the role, or null when it does. */
async function organisationProblem(
  tx: Tx,
  role: UserRole,
  organisationId: number | null,
): Promise<string | null> {
  if (organisationId == null) {
    return role === "provider" ? "Choose the provider organisation this user sends batches for." : null;
  }
  const org = await tx
    .select({ kind: organisations.kind })
    .from(organisations)
    .where(eq(organisations.id, organisationId))
    .limit(1);
  if (!org[0]) return "There is no such organisation.";
  if (role === "provider" && org[0].kind !== "provider") {
    return "A provider belongs to a provider organisation (a farm, an installer …).";
  }
  if (role !== "provider" && org[0].kind !== "team") {
    return "Analysts, leads and admins belong to a team organisation, or to none.";
  }
  return null;
}

/**
 * Creates a user, with a password or (without one) invited by e-mail to set their own. Admins
 * (user.manage) create any role; leads (user.invite) create providers and analysts. A provider
 * belongs to a provider organisation; other roles to a team organisation or none. A taken
 * e-mail is a field error. Invitations are rate-limited (lib/auth/rate-limit.ts) per `meta.ip`,
 * the client address, and per invited e-mail.
 */
export function createUser(
  actorId: number,
  input: unknown,
  meta: { ip: string } = { ip: "local" },
): Promise<Result<UserRecord>> {
  const taken = () => fail<UserRecord>(CHECK_FIELDS, { email: [EMAIL_TAKEN] }, "conflict");
  return write({
    name: "createUser",
    actorId,
    may: ["user.manage", "user.invite"],
    schema: createUserSchema,
    input,
    // two admins creating the same e-mail at once: the unique key decides
    onDuplicate: taken,
    run: async ({ tx, actor, input: data, audit }) => {
      if (!can(actor.role, "user.manage") && !INVITABLE_ROLES.includes(data.role)) {
        return fail(
          "You can invite providers and analysts only.",
          { role: ["Choose provider or analyst."] },
          "forbidden",
        );
      }
      // an invitation is an e-mail to someone else's inbox: limited per sender's address and per invitee
      if (!data.password) {
        const checks = [
          { name: "invitePerAddress", subject: meta.ip },
          { name: "invitePerTarget", subject: data.email },
        ] as const;
        await requireWithinLimits([...checks], "invitations from here or to this address");
      }
      const existing = await tx
        .select({ id: users.id })
        .from(users)
        .where(eq(users.email, data.email))
        .limit(1);
      if (existing.length > 0) return taken();
      const problem = await organisationProblem(tx, data.role, data.organisationId);
      if (problem) return fail(CHECK_FIELDS, { organisationId: [problem] });

      const passwordHash = data.password ? await hashPassword(data.password) : null;
      const values = {
        email: data.email,
        name: data.name,
        role: data.role,
        organisationId: data.organisationId,
      };
      const [created] = await tx
        .insert(users)
        .values({ ...values, passwordHash, active: true })
        .$returningId();
      if (!created) throw new Error("insert into users returned no id");
      const rec: UserRecord = { id: created.id, ...values, active: true };
      const action = data.password ? "user.create" : "user.invite";
      await audit({ action, objectType: "user", objectId: rec.id, before: null, after: rec });
      if (!data.password) {
        await issueUserLink(tx, {
          userId: rec.id,
          kind: "invite",
          email: rec.email,
          name: rec.name,
          actorId: actor.id,
        });
      }
      return ok(rec);
    },
  });
}

async function applyRoleChange(tx: Tx, audit: Audit, actorId: number, target: LockedUser, role: UserRole) {
  if (target.role === role) return target;
  if (actorId === target.id)
    refuse(fail("You cannot change your own role; ask another admin.", undefined, "conflict"));
  if ((target.role === "provider") !== (role === "provider")) {
    const message =
      target.role === "provider"
        ? "A provider belongs to a provider organisation; create a separate team account for this person instead."
        : "A provider must belong to a provider organisation; create a separate provider account instead.";
    refuse(fail(message, { role: ["Not possible for this user's organisation."] }, "conflict"));
  }
  if (target.role === "admin" && target.active) await assertAnotherActiveAdmin(tx, target.id);
  await tx.update(users).set({ role, updatedAt: new Date() }).where(eq(users.id, target.id));
  await audit({
    action: "user.role_change",
    objectType: "user",
    objectId: target.id,
    before: { role: target.role },
    after: { role },
  });
  return { ...target, role };
}

async function applyActiveChange(tx: Tx, audit: Audit, actorId: number, target: LockedUser, active: boolean) {
  if (target.active === active) return target;
  if (actorId === target.id && !active)
    refuse(fail("You cannot deactivate your own account.", undefined, "conflict"));
  if (!active && target.role === "admin") await assertAnotherActiveAdmin(tx, target.id);
  // deactivation bumps session_version: open sessions end at their next request
  const sessionVersion = active ? target.sessionVersion : target.sessionVersion + 1;
  await tx
    .update(users)
    .set({ active, sessionVersion, updatedAt: new Date() })
    .where(eq(users.id, target.id));
  await audit({
    action: active ? "user.reactivate" : "user.deactivate",
    objectType: "user",
    objectId: target.id,
    before: { active: target.active },
    after: { active },
  });
  return { ...target, active, sessionVersion };
}

const userUpdate = z.object({ id: userIdSchema }).and(updateUserSchema);

/**
 * Changes another user's role and/or active flag (user.manage) in one transaction, with an
 * audit row per change. Deactivation ends the user's open sessions. Provider ↔ team roles
 * cannot be swapped in place, and the last active admin stays an active admin.
 */
export function updateUser(actorId: number, userId: number, input: unknown): Promise<Result<UserRecord>> {
  return write({
    name: "updateUser",
    actorId,
    may: "user.manage",
    schema: userUpdate,
    input: { ...(input && typeof input === "object" ? input : {}), id: userId },
    invalid: (issues) =>
      issues.some((i) => i.path[0] === "id")
        ? fail("There is no such user.", undefined, "not_found")
        : fail(CHECK_FIELDS, fieldErrorsOf(issues)),
    run: async ({ tx, actor, input: change, audit }) => {
      let target = await lockUser(tx, change.id);
      // a refusal of the second change rolls back the first
      if (change.role !== undefined) target = await applyRoleChange(tx, audit, actor.id, target, change.role);
      if (change.active !== undefined)
        target = await applyActiveChange(tx, audit, actor.id, target, change.active);
      return ok(record(target));
    },
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
export function changeOwnPassword(
  actorId: number,
  currentPassword: string,
  newPassword: string,
  confirmPassword?: string,
): Promise<Result<{ sessionVersion: number }>> {
  return write({
    name: "changeOwnPassword",
    actorId,
    may: "signed-in",
    schema: changePasswordSchema,
    input: { currentPassword, newPassword, confirmPassword },
    run: async ({ tx, actor, input, audit }) => {
      // an unattended open session must not become a way to guess the password
      const throttleKey = `user:${actor.id}`;
      const gate = await peekLimit("passwordChange", throttleKey);
      if (!gate.allowed) {
        const wait = waitText(gate.retryAfterSeconds);
        const refused = fail<never>(`Too many wrong current passwords. Try again in ${wait}.`);
        return { ...refused, code: "rate_limited", retryAfterSeconds: gate.retryAfterSeconds };
      }
      const target = await lockUser(tx, actor.id);
      const [row] = await tx.select({ hash: users.passwordHash }).from(users).where(eq(users.id, actor.id));
      if (!(await verifyPassword(input.currentPassword, row?.hash))) {
        await countEvent("passwordChange", throttleKey);
        return fail(CHECK_FIELDS, { currentPassword: ["That is not your current password."] });
      }
      await clearLimit("passwordChange", throttleKey);
      const passwordHash = await hashPassword(input.newPassword);
      const next = target.sessionVersion + 1;
      await tx
        .update(users)
        .set({ passwordHash, sessionVersion: next, updatedAt: new Date() })
        .where(eq(users.id, actor.id));
      await audit({
        action: "user.password_change",
        objectType: "user",
        objectId: actor.id,
        before: { sessionVersion: target.sessionVersion },
        after: { sessionVersion: next },
      });
      return ok({ sessionVersion: next });
    },
  });
}
