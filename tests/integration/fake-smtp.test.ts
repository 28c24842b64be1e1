/**
 * The SMTP fake with nodemailer as the sender: a text+html message arrives, the mailbox
 * API returns it parsed, filters by recipient, survives a restart and can be cleared.
 */
import { mkdtemp, rm } from "node:fs/promises";
import os from "node:os";
import path from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { startSmtpFake, type MessageSummary, type SmtpFake, type StoredMessage } from "@/fakes/smtp";
import { createTransport } from "@/lib/mail/transport";

let dir: string;
let fake: SmtpFake;

beforeAll(async () => {
  dir = await mkdtemp(path.join(os.tmpdir(), "tributary-smtp-fake-"));
  fake = await startSmtpFake({ smtpPort: 0, httpPort: 0, dir });
});

afterAll(async () => {
  await fake?.close();
  if (dir) await rm(dir, { recursive: true, force: true });
});

async function list(query = ""): Promise<MessageSummary[]> {
  const r = await fetch(`${fake.mailboxUrl}/messages${query}`);
  expect(r.status).toBe(200);
  return ((await r.json()) as { messages: MessageSummary[] }).messages;
}

describe("SMTP fake", () => {
  it("keeps a text+html message from nodemailer and serves it parsed", async () => {
    const smtp = createTransport(fake.smtpUrl);
    const info = await smtp.sendMail({
      from: "Tributary <no-reply@tributary.test>",
      to: "provider@harrowgate.test",
      cc: "lead@lowmoor.test",
      subject: "Batch bounced: Spring barley nitrogen — Harrowgate 2026 v1",
      text: "Two findings need a fix.\nE_MISSING_RESPONSE in yield_t_ha",
      html: "<p>Two findings need a <b>fix</b>.</p><ul><li>E_MISSING_RESPONSE in yield_t_ha</li></ul>",
      messageId: "<outbox-7@tributary.test>",
      headers: { "X-Tributary-Kind": "decision" },
    });
    expect(info.accepted).toEqual(["provider@harrowgate.test", "lead@lowmoor.test"]);

    const all = await list();
    expect(all).toHaveLength(1);
    const one = await fetch(`${fake.mailboxUrl}/messages/${all[0]!.id}`);
    const m = (await one.json()) as StoredMessage;
    expect(m.subject).toBe("Batch bounced: Spring barley nitrogen — Harrowgate 2026 v1");
    expect(m.from).toMatch(/^"?Tributary"? <no-reply@tributary\.test>$/);
    expect(m.fromAddress).toBe("no-reply@tributary.test");
    expect(m.to).toEqual(["provider@harrowgate.test"]);
    expect(m.cc).toEqual(["lead@lowmoor.test"]);
    expect(m.envelope).toEqual({
      from: "no-reply@tributary.test",
      to: ["provider@harrowgate.test", "lead@lowmoor.test"],
    });
    expect(m.text.trim()).toBe("Two findings need a fix.\nE_MISSING_RESPONSE in yield_t_ha");
    expect(m.html).toContain("<li>E_MISSING_RESPONSE in yield_t_ha</li>");
    expect(m.messageId).toBe("<outbox-7@tributary.test>");
    expect(m.headers["x-tributary-kind"]).toBe("decision");
    expect(m.headers["content-type"]).toMatch(/^multipart\/alternative/);

    const raw = await fetch(`${fake.mailboxUrl}/messages/${m.id}/raw`);
    expect(await raw.text()).toContain("Message-ID: <outbox-7@tributary.test>");
  });

  it("filters by recipient (To, Cc or envelope), case-insensitively", async () => {
    const smtp = createTransport(fake.smtpUrl);
    await smtp.sendMail({ from: "a@tributary.test", to: "Analyst@Lowmoor.test", subject: "s2", text: "t2" });
    expect((await list("?to=analyst@lowmoor.test")).map((m) => m.subject)).toEqual(["s2"]);
    expect((await list("?to=lead@lowmoor.test")).map((m) => m.subject)).toHaveLength(1);
    expect(await list("?to=nobody@nowhere.test")).toEqual([]);
    expect((await fetch(`${fake.mailboxUrl}/messages/does-not-exist`)).status).toBe(404);
  });

  it("keeps messages across a restart, and DELETE /messages clears them", async () => {
    const before = await list();
    expect(before).toHaveLength(2);
    await fake.close();
    fake = await startSmtpFake({ smtpPort: 0, httpPort: 0, dir });
    expect((await list()).map((m) => m.id)).toEqual(before.map((m) => m.id));
    const del = await fetch(`${fake.mailboxUrl}/messages`, { method: "DELETE" });
    expect(await del.json()).toEqual({ deleted: 2 });
    expect(await list()).toEqual([]);
    await fake.close();
    fake = await startSmtpFake({ smtpPort: 0, httpPort: 0, dir });
    expect(await list()).toEqual([]);
  });
});
