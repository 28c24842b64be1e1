/**
 * The weekly digest: batches waiting, decided and bounced in the week, pools that crossed
 * their df target; queued once per lead per week, "send now" each time, refused to providers.
 */
import { afterAll, beforeAll, describe, expect, it, vi } from "vitest";
import { and, eq, like } from "drizzle-orm";
import { getDb, getPool } from "@/db/client";
import { auditEvents, emailOutbox, users } from "@/db/schema";
import { barleyBatches } from "@/lib/demo/batches";
import { decideVersion } from "@/lib/batches/commands-decide";
import { composeDigest, digestData } from "@/lib/pool/digest-compose";
import { digestDue } from "@/lib/pool/digest-schedule";
import { sendDigest } from "@/lib/pool/digest-send";
import { uploadAndCheck, userId } from "./helpers/pipeline";
import { releaseScratchStudy, scratchStudy } from "./helpers/seeded";

vi.mock("server-only", () => ({}));

const db = getDb();
const SLUG = `digest-${process.pid}`;
const TITLE = `Digest test ${SLUG}`;
let waitingId = "";
let bouncedId = "";

beforeAll(async () => {
  await scratchStudy(SLUG, { title: TITLE, providers: ["harrowgate", "fennick-hill"] });
  const analyst = await userId("analyst@lowmoor.test");
  const demo = barleyBatches();
  // 180 clean plots: the pool goes from empty to past its target of 150 residual df
  const a = await uploadAndCheck("provider@harrowgate.test", SLUG, demo[0]!.csv);
  expect((await decideVersion(analyst, a.batchPublicId, 1, { decision: "accept" })).ok).toBe(true);
  const b = await uploadAndCheck("provider@fennick.test", SLUG, demo[1]!.csv);
  expect(
    (
      await decideVersion(analyst, b.batchPublicId, 1, {
        decision: "bounce",
        comment: "Soil levels as in the plan.",
      })
    ).ok,
  ).toBe(true);
  bouncedId = b.batchPublicId;
  const c = await uploadAndCheck("provider@fennick.test", SLUG, demo[5]!.csv);
  waitingId = c.batchPublicId;
});

afterAll(async () => {
  await releaseScratchStudy(SLUG);
  await getPool().end();
});

describe("weekly digest", () => {
  it("lists what waits, what was decided and bounced, and the pool that crossed its target", async () => {
    const d = await digestData(db, new Date(Date.now() + 1000));
    expect(d.waiting.some((w) => w.batchPublicId === waitingId)).toBe(true);
    expect(d.bounced.some((b) => b.batchPublicId === bouncedId)).toBe(true);
    expect(d.accepted).toBeGreaterThanOrEqual(1);
    const pool = d.pools.find((p) => p.slug === SLUG)!;
    expect(pool).toMatchObject({ before: 0, target: 150, change: "crossed" });
    expect(pool.after).toBeGreaterThanOrEqual(150);
    const mail = composeDigest(d, "http://127.0.0.1:3410");
    expect(mail.text).toContain(`${TITLE} crossed its target this week`);
    expect(mail.text).toContain(`/batches/${waitingId}?v=1`);
    expect(mail.html).toContain("crossed its target this week");
    // a week later nothing new happened: the same pool is simply above its target
    const later = await digestData(db, new Date(Date.now() + 8 * 86_400_000));
    expect(later.pools.find((p) => p.slug === SLUG)?.change).toBe("above");
  });

  it("queues one message per active lead, once a week for the schedule and each time for 'send now'", async () => {
    const leads = await db
      .select({ email: users.email })
      .from(users)
      .where(and(eq(users.role, "lead"), eq(users.active, true)));
    const lead = await userId("lead@lowmoor.test");
    const now = new Date(Date.now() + 2000);
    const first = await sendDigest({ actorId: null, now, reason: "weekly" });
    expect(first).toMatchObject({ ok: true, data: { recipients: leads.length, queued: leads.length } });
    const again = await sendDigest({
      actorId: null,
      now: new Date(now.getTime() + 60_000),
      reason: "weekly",
    });
    expect(again).toMatchObject({ ok: true, data: { queued: 0 } });
    const manual = await sendDigest({ actorId: lead, now: new Date(now.getTime() + 120_000), reason: "now" });
    expect(manual).toMatchObject({ ok: true, data: { queued: leads.length } });
    const rows = await db
      .select()
      .from(emailOutbox)
      .where(
        and(
          eq(emailOutbox.kind, "digest"),
          eq(emailOutbox.toAddress, "lead@lowmoor.test"),
          like(emailOutbox.dedupeKey, "digest:%"),
        ),
      );
    expect(rows.length).toBeGreaterThanOrEqual(2);
    expect(rows.at(-1)?.textBody).toContain(TITLE);
    const audit = await db
      .select()
      .from(auditEvents)
      .where(and(eq(auditEvents.action, "digest.send"), eq(auditEvents.actorId, lead)));
    expect(audit.length).toBeGreaterThanOrEqual(1);
  });

  it("refuses providers and analysts, and is due from Monday 07:00 UTC", async () => {
    expect(
      await sendDigest({ actorId: await userId("provider@harrowgate.test"), reason: "now" }),
    ).toMatchObject({ ok: false, code: "forbidden" });
    expect(await sendDigest({ actorId: await userId("analyst@lowmoor.test"), reason: "now" })).toMatchObject({
      ok: false,
      code: "forbidden",
    });
    expect(digestDue(new Date("2026-11-30T06:59:00Z"))).toBe(false);
    expect(digestDue(new Date("2026-11-30T07:00:00Z"))).toBe(true);
    expect(digestDue(new Date("2026-12-02T01:00:00Z"))).toBe(true);
  });
});
