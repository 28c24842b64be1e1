/**
 * Accept and bounce against the real MariaDB: one winner of two concurrent decisions, the
 * state checks, the audit row, and the e-mails queued to the provider organisation.
 */
import { afterAll, describe, expect, it } from "vitest";
import { and, eq } from "drizzle-orm";
import { getDb, getPool } from "@/db/client";
import { auditEvents, batchVersions, decisions, emailOutbox, findingComments } from "@/db/schema";
import { getVersionReportForUser } from "@/lib/batches/queries-reports";
import { barleyBatches } from "@/lib/demo/batches";
import { decideVersion } from "@/lib/batches/commands-decide";
import { uploadAndCheck, userId } from "./helpers/pipeline";
import { sessionUser } from "./helpers/seeded";

const db = getDb();
const fennick = () => barleyBatches()[1]!.csv;

afterAll(async () => {
  await getPool().end();
});

describe("decisions", () => {
  it("a bounce with two comments records them, moves the state, writes the audit row and queues the e-mail", async () => {
    const up = await uploadAndCheck("provider@fennick.test", "barley-nitrogen", fennick());
    expect(up.report?.status).toBe("checked");
    const analyst = await userId("analyst@lowmoor.test");
    const r = await decideVersion(analyst, up.batchPublicId, 1, {
      decision: "bounce",
      comment: "Please send the soil levels as in the plan and drop the computed water column.",
      findingComments: [
        {
          code: "level.variant",
          columns: ["soil"],
          comment: "Write clay in lower case without the trailing space.",
        },
        {
          code: "collinear.exact",
          columns: ["total_water_mm"],
          comment: "total_water_mm is irrigation plus rainfall here; use the gauge reading.",
        },
      ],
    });
    expect(r).toMatchObject({ ok: true, data: { state: "bounced", emailsQueued: 1 } });
    const [v] = await db
      .select({ state: batchVersions.state })
      .from(batchVersions)
      .where(eq(batchVersions.id, up.batchVersionId));
    expect(v?.state).toBe("bounced");
    expect(
      await db.select().from(findingComments).where(eq(findingComments.batchVersionId, up.batchVersionId)),
    ).toHaveLength(2);
    const audit = await db
      .select()
      .from(auditEvents)
      .where(and(eq(auditEvents.batchId, up.batchId), eq(auditEvents.action, "batch.bounce")));
    expect(audit).toHaveLength(1);
    expect(audit[0]?.actorId).toBe(analyst);
    const mail = await db.select().from(emailOutbox).where(eq(emailOutbox.batchId, up.batchId));
    expect(mail).toHaveLength(1);
    expect(mail[0]?.toAddress).toBe("provider@fennick.test");
    expect(mail[0]?.textBody).toContain("Write clay in lower case");
    expect(mail[0]?.textBody).toContain("use the gauge reading");
    expect(mail[0]?.textBody).toContain(`/batches/${up.batchPublicId}?v=1`);
    expect(mail[0]?.htmlBody).toContain("level.variant");

    // the comments reach the provider of that organisation, and nobody outside the batch's scope
    const asUser = sessionUser;
    const own = await getVersionReportForUser(await asUser("provider@fennick.test"), up.batchPublicId, 1);
    expect(own?.decision?.findingComments.map((c) => c.code).sort()).toEqual([
      "collinear.exact",
      "level.variant",
    ]);
    expect(
      await getVersionReportForUser(await asUser("provider@harrowgate.test"), up.batchPublicId, 1),
    ).toBeNull();
    expect(
      await getVersionReportForUser(await asUser("analyst2@lowmoor.test"), up.batchPublicId, 1),
    ).toBeNull();
  });

  it("of two analysts deciding at the same moment exactly one wins; the other is told who decided", async () => {
    const up = await uploadAndCheck("provider@harrowgate.test", "barley-nitrogen", barleyBatches()[0]!.csv);
    const a = await userId("analyst@lowmoor.test");
    const admin = await userId("admin@tributary.test");
    const results = await Promise.all([
      decideVersion(a, up.batchPublicId, 1, { decision: "accept" }),
      decideVersion(admin, up.batchPublicId, 1, {
        decision: "bounce",
        comment: "Too few rows from the headland plots.",
      }),
    ]);
    const wins = results.filter((r) => r.ok);
    const losses = results.filter((r) => !r.ok);
    expect(wins).toHaveLength(1);
    expect(losses).toHaveLength(1);
    const loss = losses[0]!;
    if (!loss.ok)
      expect(loss.message).toMatch(/already (accepted|bounced) by (Tobias Ferrell|Morwenna Tate)/);
    expect(
      await db.select().from(decisions).where(eq(decisions.batchVersionId, up.batchVersionId)),
    ).toHaveLength(1);
  });

  it("refuses a superseded version, a provider, an unassigned analyst and a bounce without a comment", async () => {
    const v1 = await uploadAndCheck("provider@harrowgate.test", "barley-nitrogen", barleyBatches()[0]!.csv);
    await uploadAndCheck("provider@harrowgate.test", "barley-nitrogen", barleyBatches()[0]!.csv, {
      batchPublicId: v1.batchPublicId,
    });
    const analyst = await userId("analyst@lowmoor.test");
    const superseded = await decideVersion(analyst, v1.batchPublicId, 1, { decision: "accept" });
    expect(superseded).toMatchObject({ ok: false, code: "conflict" });
    if (!superseded.ok) expect(superseded.message).toMatch(/superseded by version 2/);

    const provider = await decideVersion(await userId("provider@harrowgate.test"), v1.batchPublicId, 2, {
      decision: "accept",
    });
    expect(provider).toMatchObject({ ok: false, code: "forbidden" });
    // analyst2 reviews the heat-pump study only: the barley batch answers as not found
    const other = await decideVersion(await userId("analyst2@lowmoor.test"), v1.batchPublicId, 2, {
      decision: "accept",
    });
    expect(other).toMatchObject({ ok: false, code: "not_found" });
    const silent = await decideVersion(analyst, v1.batchPublicId, 2, { decision: "bounce" });
    expect(silent.ok).toBe(false);
    if (!silent.ok) expect(silent.fieldErrors?.comment?.[0]).toMatch(/what the provider must fix/);
    const [v2] = await db
      .select({ state: batchVersions.state })
      .from(batchVersions)
      .where(and(eq(batchVersions.batchId, v1.batchId), eq(batchVersions.version, 2)));
    expect(v2?.state).toBe("ready");
  });
});
