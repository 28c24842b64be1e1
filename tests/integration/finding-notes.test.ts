/**
 * Notes on findings before the decision (issue 11: "comment on a finding" through the API): an
 * analyst notes a finding through POST …/finding-comments; the note waits with the version, is shown
 * to analysts and never to the provider; the decision takes it into the provider's e-mail (a bounce
 * with only notes says what to fix); a decided version takes no more notes (409, RFC 9110 §15.5.10);
 * a finding the report does not have is refused with the codes it does have (422, RFC 9110 §15.5.21).
 */
import { afterAll, beforeAll, describe, expect, it, vi } from "vitest";
import { eq } from "drizzle-orm";
import { getDb, getPool } from "@/db/client";
import { emailOutbox } from "@/db/schema";
import { barleyBatches } from "@/lib/demo/batches";
import { decideVersion } from "@/lib/batches/commands-decide";
import { BOUNCE_NEEDS_COMMENT } from "@/lib/batches/schemas";
import { getVersionReportForUser } from "@/lib/batches/queries-reports";
import { call, expectSafeError, type Caller } from "./helpers/api";
import { uploadAndCheck, userId } from "./helpers/pipeline";
import { cookieOf, releaseScratchStudy, scratchStudy, sessionUser } from "./helpers/seeded";

vi.mock("server-only", () => ({}));

const route = await import("@/app/api/v1/batches/[id]/versions/[version]/finding-comments/route");

const SLUG = `notes-${process.pid}`;
const as: Record<"analyst" | "provider" | "otherProvider" | "lead", Caller> = {
  analyst: {},
  provider: {},
  otherProvider: {},
  lead: {},
};
let batch = { batchPublicId: "", batchId: 0 };

const path = (v = 1) => `/api/v1/batches/${batch.batchPublicId}/versions/${v}/finding-comments`;
const params = (v = 1) => ({ id: batch.batchPublicId, version: String(v) });
const list = (who: Caller) => call(route.GET, { path: path(), params: params(), as: who });
const note = (who: Caller, body: unknown) =>
  call(route.POST, { method: "POST", path: path(), params: params(), as: who, body });

beforeAll(async () => {
  await scratchStudy(SLUG, { title: `Notes test ${SLUG}` });
  as.analyst = { cookie: await cookieOf("analyst@lowmoor.test") };
  as.provider = { cookie: await cookieOf("provider@fennick.test") };
  as.otherProvider = { cookie: await cookieOf("provider@harrowgate.test") };
  as.lead = { cookie: await cookieOf("lead@lowmoor.test") };
  // Fennick Hill's demo file writes the soil level "Clay" and "clay ": a level.variant finding
  batch = await uploadAndCheck("provider@fennick.test", SLUG, barleyBatches()[1]!.csv);
});

afterAll(async () => {
  await releaseScratchStudy(SLUG);
  await getPool().end();
});

describe("notes on findings", () => {
  it("a note on a finding answers 201 with Location and waits, seen by analysts and leads only", async () => {
    const made = await note(as.analyst, {
      code: "level.variant",
      columns: ["soil"],
      comment: "Write the soil level as clay, lower case.",
    });
    expect(made.status).toBe(201);
    expect(made.headers.get("location")).toBe(path());
    expect(made.json.data).toMatchObject({ code: "level.variant", columns: ["soil"] });

    const seen = await list(as.analyst);
    expect(seen.status).toBe(200);
    expect(seen.json.data).toEqual([
      expect.objectContaining({
        code: "level.variant",
        sent: false,
        comment: "Write the soil level as clay, lower case.",
      }),
    ]);
    expect(((await list(as.lead)).json.data as unknown[]).length).toBe(1);
    // the provider sees nothing until a decision sends it
    const provider = await list(as.provider);
    expect(provider.status).toBe(200);
    expect(provider.json.data).toEqual([]);
    // another organisation's provider does not learn the batch exists
    expect((await list(as.otherProvider)).status).toBe(404);

    const analyst = await sessionUser("analyst@lowmoor.test");
    const page = await getVersionReportForUser(analyst, batch.batchPublicId, 1);
    expect(page?.notes.map((n) => n.code)).toEqual(["level.variant"]);
    const providerUser = await sessionUser("provider@fennick.test");
    expect((await getVersionReportForUser(providerUser, batch.batchPublicId, 1))?.notes).toEqual([]);
  });

  it("refuses a finding the report does not have, naming the ones it has; and providers (403)", async () => {
    const wrong = await note(as.analyst, { code: "number.sentinel-typo", comment: "?" });
    expect(wrong.status).toBe(422);
    expectSafeError(wrong.json, "invalid");
    expect(wrong.json.detail).toContain('no finding "number.sentinel-typo"');
    expect(wrong.json.detail).toContain("level.variant");
    const empty = await note(as.analyst, { code: "level.variant", comment: "   " });
    expect(empty.status).toBe(422);
    expect(empty.json.errors?.comment?.[0]).toBe("A finding comment cannot be empty.");
    const byProvider = await note(as.provider, { code: "level.variant", comment: "Self-review." });
    expect(byProvider.status).toBe(403);
  });

  it("a bounce with only the note says what to fix: the e-mail carries it; then no more notes (409)", async () => {
    const analystId = await userId("analyst@lowmoor.test");
    const r = await decideVersion(analystId, batch.batchPublicId, 1, { decision: "bounce" });
    expect(r.ok, JSON.stringify(r)).toBe(true);
    const mail = await getDb().select().from(emailOutbox).where(eq(emailOutbox.batchId, batch.batchId));
    expect(mail).toHaveLength(1);
    expect(mail[0]?.textBody).toContain("Write the soil level as clay, lower case.");
    expect(mail[0]?.htmlBody).toContain("level.variant");

    const sent = await list(as.provider);
    expect(sent.json.data).toEqual([expect.objectContaining({ code: "level.variant", sent: true })]);

    const late = await note(as.analyst, { code: "level.variant", comment: "One more thing." });
    expect(late.status).toBe(409);
    expect(late.json.detail).toContain("already bounced");
  });

  it("a bounce with no comment, no finding comment and no note is refused with what to do", async () => {
    const next = await uploadAndCheck("provider@fennick.test", SLUG, barleyBatches()[1]!.csv, {
      batchPublicId: batch.batchPublicId,
    });
    expect(next.version).toBe(2);
    const r = await decideVersion(await userId("analyst@lowmoor.test"), batch.batchPublicId, 2, {
      decision: "bounce",
    });
    expect(r.ok).toBe(false);
    if (!r.ok) {
      expect(r.message).toBe(BOUNCE_NEEDS_COMMENT);
      expect(r.fieldErrors?.comment).toEqual([BOUNCE_NEEDS_COMMENT]);
    }
    // version 1 is superseded now: its notes are closed too
    const old = await note(as.analyst, { code: "level.variant", comment: "Too late." });
    expect(old.status).toBe(409);
    expect(old.json.detail).toContain("superseded by version 2");
  });
});
