/**
 * The e-mail outbox against the integration database and the SMTP fake: an outage loses
 * nothing and backs off, recovery delivers each message exactly once, concurrent senders
 * never send a row twice, and a dead sender's claim is taken over with the same Message-ID.
 * Only this file's rows are asserted on (its recipients and dedupe keys carry a run tag).
 */
import { randomBytes } from "node:crypto";
import { mkdtemp, rm } from "node:fs/promises";
import os from "node:os";
import path from "node:path";
import { eq, like, sql } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { getDb } from "@/db/client";
import { emailOutbox } from "@/db/schema";
import { startSmtpFake, type MessageSummary, type SmtpFake, type StoredMessage } from "@/fakes/smtp";
import {
  createTransport,
  deliverOutbox,
  enqueueEmail,
  messageIdFor,
  retryDelayMs,
  runMailSender,
  type DeliverOptions,
} from "@/lib/mail";

const run = randomBytes(4).toString("hex");
const FROM = "Tributary <no-reply@tributary.test>";
const addr = (name: string) => `${name}-${run}@outbox.test`;
const key = (name: string) => `test-outbox-${run}-${name}`;

let dir: string;
let fake: SmtpFake | null = null;
let smtpPort = 0;

async function startFake(): Promise<SmtpFake> {
  fake = await startSmtpFake({ smtpPort, httpPort: 0, dir });
  smtpPort = fake.smtpPort;
  return fake;
}

const opts = (): DeliverOptions => ({
  transport: createTransport(`smtp://127.0.0.1:${smtpPort}`),
  from: FROM,
  baseDelayMs: 1000,
  maxDelayMs: 60_000,
});

async function inbox(to: string): Promise<MessageSummary[]> {
  const r = await fetch(`${fake!.mailboxUrl}/messages?to=${encodeURIComponent(to)}`);
  return ((await r.json()) as { messages: MessageSummary[] }).messages;
}

async function myRows() {
  return getDb()
    .select({
      id: emailOutbox.id,
      dedupeKey: emailOutbox.dedupeKey,
      to: emailOutbox.toAddress,
      status: emailOutbox.status,
      attempts: emailOutbox.attempts,
      lastError: emailOutbox.lastError,
      messageId: emailOutbox.messageId,
      createdAt: emailOutbox.createdAt,
      /** ms until the next attempt, by the database clock */
      dueInMs: sql<number>`TIMESTAMPDIFF(MICROSECOND, NOW(3), ${emailOutbox.nextAttemptAt}) / 1000`.mapWith(
        Number,
      ),
    })
    .from(emailOutbox)
    .where(like(emailOutbox.dedupeKey, `test-outbox-${run}-%`))
    .orderBy(emailOutbox.id);
}

async function drain(o: DeliverOptions): Promise<void> {
  for (let i = 0; i < 50; i++) if ((await deliverOutbox(o)).claimed === 0) return;
}

beforeAll(async () => {
  dir = await mkdtemp(path.join(os.tmpdir(), "tributary-outbox-mail-"));
  // take a free port, then stop: SMTP is "down" at a known address
  await startFake();
  await fake!.close();
  fake = null;
});

afterAll(async () => {
  await fake?.close();
  if (dir) await rm(dir, { recursive: true, force: true });
});

describe("outbox", () => {
  it("queues each dedupe key once and refuses a malformed message with a clear reason", async () => {
    await getDb().transaction(async (tx) => {
      for (const n of ["a", "b", "c"]) {
        const r = await enqueueEmail(tx, {
          dedupeKey: key(n),
          kind: "decision",
          to: addr(n),
          subject: `Batch bounced (${n})`,
          text: `Plain text for ${n}`,
          html: `<p>HTML for <b>${n}</b></p>`,
        });
        expect(r.queued).toBe(true);
      }
      const again = await enqueueEmail(tx, {
        dedupeKey: key("a"),
        kind: "decision",
        to: addr("a"),
        subject: "x",
        text: "x",
        html: "",
      });
      expect(again.queued).toBe(false);
    });
    expect((await myRows()).map((r) => r.status)).toEqual(["pending", "pending", "pending"]);
    await expect(
      enqueueEmail(getDb(), {
        dedupeKey: key("bad"),
        kind: "decision",
        to: "not-an-address",
        subject: "s",
        text: "t",
        html: "",
      }),
    ).rejects.toThrow(/"not-an-address" is not an e-mail address/);
  });

  it("with SMTP down nothing is lost: rows stay pending with a doubling back-off", async () => {
    await deliverOutbox(opts());
    let rows = await myRows();
    expect(rows.map((r) => [r.status, r.attempts])).toEqual([
      ["pending", 1],
      ["pending", 1],
      ["pending", 1],
    ]);
    for (const r of rows) {
      expect(r.lastError).toMatch(/ECONNREFUSED|connect/i);
      // first retry after base = 1000 ms (minus the time since)
      expect(r.dueInMs).toBeGreaterThan(400);
      expect(r.dueInMs).toBeLessThanOrEqual(1000);
    }
    // not due yet: an immediate round leaves them alone
    await deliverOutbox(opts());
    expect((await myRows()).map((r) => r.attempts)).toEqual([1, 1, 1]);

    await new Promise((r) => setTimeout(r, 1100));
    await deliverOutbox(opts());
    rows = await myRows();
    expect(rows.map((r) => [r.status, r.attempts])).toEqual([
      ["pending", 2],
      ["pending", 2],
      ["pending", 2],
    ]);
    // second retry after 2 × base
    for (const r of rows) {
      expect(r.dueInMs).toBeGreaterThan(1400);
      expect(r.dueInMs).toBeLessThanOrEqual(2000);
    }
    expect(retryDelayMs(3, 1000, 60_000)).toBe(4000);
    expect(retryDelayMs(20, 1000, 60_000)).toBe(60_000);
  });

  it("when SMTP is back, each message is delivered exactly once, text and html, with its row's Message-ID", async () => {
    await startFake();
    await new Promise((r) => setTimeout(r, 2100));
    await drain(opts());
    await drain(opts());
    const rows = await myRows();
    expect(rows.map((r) => r.status)).toEqual(["sent", "sent", "sent"]);
    for (const r of rows) {
      const got = await inbox(r.to);
      expect(got).toHaveLength(1);
      expect(got[0]!.messageId).toBe(messageIdFor(r, FROM));
      expect(r.messageId).toBe(`<outbox-${r.id}.${r.createdAt.getTime().toString(36)}@tributary.test>`);
      const full = (await (
        await fetch(`${fake!.mailboxUrl}/messages/${got[0]!.id}`)
      ).json()) as StoredMessage;
      const n = r.dedupeKey.slice(-1);
      expect(full.subject).toBe(`Batch bounced (${n})`);
      expect(full.text.trim()).toBe(`Plain text for ${n}`);
      expect(full.html).toContain(`<b>${n}</b>`);
    }
  });

  it("concurrent senders never send the same row twice", async () => {
    const names = Array.from({ length: 12 }, (_, i) => `con${i}`);
    await getDb().transaction(async (tx) => {
      for (const n of names)
        await enqueueEmail(tx, {
          dedupeKey: key(n),
          kind: "invite",
          to: addr(n),
          subject: `Invitation ${n}`,
          text: "t",
          html: "",
        });
    });
    const o = { ...opts(), limit: 2 };
    await Promise.all([
      drain(o),
      drain(o),
      drain(o),
      drain({ ...o, transport: createTransport(`smtp://127.0.0.1:${smtpPort}`) }),
    ]);
    for (const n of names) expect(await inbox(addr(n))).toHaveLength(1);
    const rows = (await myRows()).filter((r) => r.dedupeKey.includes("-con"));
    expect(rows.every((r) => r.status === "sent" && r.attempts === 1)).toBe(true);
  });

  it("a claim left by a dead sender is retried once its lease runs out, with the same Message-ID", async () => {
    await getDb().transaction(async (tx) => {
      for (const n of ["stale", "leased"])
        await enqueueEmail(tx, {
          dedupeKey: key(n),
          kind: "reset",
          to: addr(n),
          subject: n,
          text: n,
          html: "",
        });
    });
    // a sender claimed both and died; one lease has run out, the other has not
    await getDb()
      .update(emailOutbox)
      .set({ status: "sending", attempts: 1, nextAttemptAt: sql`DATE_SUB(NOW(3), INTERVAL 1 SECOND)` })
      .where(eq(emailOutbox.dedupeKey, key("stale")));
    await getDb()
      .update(emailOutbox)
      .set({ status: "sending", attempts: 1, nextAttemptAt: sql`DATE_ADD(NOW(3), INTERVAL 5 MINUTE)` })
      .where(eq(emailOutbox.dedupeKey, key("leased")));
    await drain(opts());
    const rows = await myRows();
    const stale = rows.find((r) => r.dedupeKey === key("stale"))!;
    const leased = rows.find((r) => r.dedupeKey === key("leased"))!;
    expect([stale.status, stale.attempts]).toEqual(["sent", 2]);
    expect([leased.status, leased.attempts]).toEqual(["sending", 1]);
    const got = await inbox(addr("stale"));
    expect(got.map((m) => m.messageId)).toEqual([messageIdFor(stale, FROM)]);
    expect(await inbox(addr("leased"))).toEqual([]);
  });

  it("gives up after maxAttempts and marks the row failed with the reason", async () => {
    await enqueueEmail(getDb(), {
      dedupeKey: key("doomed"),
      kind: "decision",
      to: addr("doomed"),
      subject: "d",
      text: "d",
      html: "",
    });
    const down = { ...opts(), transport: createTransport("smtp://127.0.0.1:9"), maxAttempts: 1 };
    await deliverOutbox(down);
    const row = (await myRows()).find((r) => r.dedupeKey === key("doomed"))!;
    expect(row.status).toBe("failed");
    expect(row.lastError).toBeTruthy();
  });

  it("runMailSender delivers what is queued while it runs and stops on abort", async () => {
    const ac = new AbortController();
    const loop = runMailSender({ signal: ac.signal, intervalMs: 100, deliver: opts(), log: () => {} });
    await enqueueEmail(getDb(), {
      dedupeKey: key("loop"),
      kind: "invite",
      to: addr("loop"),
      subject: "loop",
      text: "loop",
      html: "",
    });
    let got: MessageSummary[] = [];
    for (let i = 0; i < 50 && got.length === 0; i++) {
      await new Promise((r) => setTimeout(r, 100));
      got = await inbox(addr("loop"));
    }
    ac.abort();
    await loop;
    expect(got.map((m) => m.subject)).toEqual(["loop"]);
  });
});
