/** Invitations and password resets: the link e-mail is queued, works once, expires, and refuses unknown tokens. */
import { afterAll, describe, expect, it } from "vitest";
import { desc, eq } from "drizzle-orm";
import { getDb, getPool } from "@/db/client";
import { emailOutbox, organisations, userTokens, users } from "@/db/schema";
import { verifyPassword } from "@/lib/auth/password";
import { createUser } from "@/lib/people/commands-users";
import { describeLink, requestPasswordReset, setPasswordWithLink } from "@/lib/people/commands-links";
import { userId } from "./helpers/pipeline";

const db = getDb();
afterAll(async () => {
  await getPool().end();
});

async function lastMailTo(email: string) {
  const [m] = await db
    .select()
    .from(emailOutbox)
    .where(eq(emailOutbox.toAddress, email))
    .orderBy(desc(emailOutbox.id))
    .limit(1);
  return m;
}
const tokenIn = (text: string) => /\/set-password\/([A-Za-z0-9_-]+)/.exec(text)?.[1] ?? "";

describe("invitations", () => {
  it("a lead invites a provider: no password yet, an e-mail with a one-time link that sets it", async () => {
    const lead = await userId("lead@lowmoor.test");
    const [farm] = await db
      .select({ id: organisations.id })
      .from(organisations)
      .where(eq(organisations.slug, "coldwell"));
    const email = `new.provider.${Date.now()}@coldwell.test`;
    const r = await createUser(lead, {
      email,
      name: "Nell Brisco",
      role: "provider",
      organisationId: String(farm!.id),
      password: "",
    });
    expect(r.ok).toBe(true);
    const [u] = await db.select({ hash: users.passwordHash }).from(users).where(eq(users.email, email));
    expect(u?.hash).toBeNull();
    const mail = await lastMailTo(email);
    expect(mail?.kind).toBe("invitation");
    const token = tokenIn(mail!.textBody);
    expect(token.length).toBeGreaterThan(20);
    expect(await describeLink(token)).toMatchObject({ kind: "invite", email });

    const short = await setPasswordWithLink(token, { password: "short", confirmPassword: "short" });
    expect(short.ok).toBe(false);
    if (!short.ok) expect(short.fieldErrors?.password?.[0]).toMatch(/at least 10/);
    const done = await setPasswordWithLink(token, {
      password: "barley-and-oats-2026",
      confirmPassword: "barley-and-oats-2026",
    });
    expect(done.ok).toBe(true);
    const [after] = await db.select({ hash: users.passwordHash }).from(users).where(eq(users.email, email));
    expect(await verifyPassword("barley-and-oats-2026", after?.hash)).toBe(true);
    const again = await setPasswordWithLink(token, {
      password: "another-password-1",
      confirmPassword: "another-password-1",
    });
    expect(again).toMatchObject({ ok: false, code: "not_found" });
    expect(await describeLink(token)).toBeNull();
  });

  it("a lead cannot invite a lead", async () => {
    const r = await createUser(await userId("lead@lowmoor.test"), {
      email: `x${Date.now()}@lowmoor.test`,
      name: "X",
      role: "lead",
      organisationId: "",
      password: "",
    });
    expect(r).toMatchObject({ ok: false, code: "forbidden" });
  });
});

describe("password resets", () => {
  it("answers the same for unknown addresses and queues nothing for them", async () => {
    const before = (await db.select({ id: emailOutbox.id }).from(emailOutbox)).length;
    expect(await requestPasswordReset("nobody.here@example.org")).toEqual({ ok: true, data: null });
    expect((await db.select({ id: emailOutbox.id }).from(emailOutbox)).length).toBe(before);
  });

  it("sends a link that sets a new password and ends older sessions; an expired link is refused", async () => {
    const email = "provider@harrowgate.test";
    const [before] = await db.select({ sv: users.sessionVersion }).from(users).where(eq(users.email, email));
    expect((await requestPasswordReset(email)).ok).toBe(true);
    const mail = await lastMailTo(email);
    expect(mail?.kind).toBe("password-reset");
    const token = tokenIn(mail!.textBody);
    const r = await setPasswordWithLink(token, {
      password: "tributary-demo",
      confirmPassword: "tributary-demo",
    });
    expect(r.ok).toBe(true);
    const [after] = await db.select({ sv: users.sessionVersion }).from(users).where(eq(users.email, email));
    expect(after!.sv).toBe(before!.sv + 1);

    expect((await requestPasswordReset(email)).ok).toBe(true);
    const token2 = tokenIn((await lastMailTo(email))!.textBody);
    await db
      .update(userTokens)
      .set({ expiresAt: new Date(Date.now() - 1000) })
      .where(eq(userTokens.userId, await userId(email)));
    expect(await describeLink(token2)).toBeNull();
    expect(
      await setPasswordWithLink(token2, { password: "tributary-demo", confirmPassword: "tributary-demo" }),
    ).toMatchObject({ ok: false });
  });

  it("refuses a made-up token", async () => {
    expect(await describeLink("not-a-real-token-000000000000")).toBeNull();
    expect(
      (
        await setPasswordWithLink("not-a-real-token-000000000000", {
          password: "whatever-long-1",
          confirmPassword: "whatever-long-1",
        })
      ).ok,
    ).toBe(false);
  });
});
