/**
 * Organisation isolation through the file paths, the JSON and the e-mails, on the real
 * pipeline (upload-service fake, API upload, worker check): the original file is served only
 * by GET …/versions/:n/file after the report's scope check (404 outside it, 401 anonymous);
 * the stored file is private, so its raw address without a signature is refused by the file
 * store; no API answer carries a file key or store address; decision e-mails reach only the
 * batch's provider organisation and the digest only the leads, with every user-typed text
 * escaped in their HTML.
 */
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { and, eq, inArray } from "drizzle-orm";
import { getDb, getPool } from "@/db/client";
import { batches, batchVersions, emailOutbox, organisations, users } from "@/db/schema";
import { barleyBatches } from "@/lib/demo/batches";
import { sendDigest } from "@/lib/pool/digest-send";
import { decideVersion } from "@/lib/batches/commands-decide";
import { GET as fileRoute } from "@/app/api/v1/batches/[id]/versions/[version]/file/route";
import { GET as reportRoute } from "@/app/api/v1/batches/[id]/versions/[version]/report/route";
import { GET as batchRoute } from "@/app/api/v1/batches/[id]/route";
import { GET as batchesRoute } from "@/app/api/v1/batches/route";
import { GET as poolRoute } from "@/app/api/v1/pool/[slug]/route";
import { GET as dictionaryRoute } from "@/app/api/v1/pool/[slug]/dictionary/route";
import { GET as ifAcceptedRoute } from "@/app/api/v1/pool/[slug]/if-accepted/route";
import { userId } from "./helpers/pipeline";
import { callAs, startFileStore, stopFileStore, uploadChecked } from "./helpers/security-world";

const STUDY = "barley-nitrogen";
const LABEL = '<img src=x onerror=alert(1)> plots "spring"';
const csv = barleyBatches()[0]!.csv;
let fakeUrl = "";
let ready = { batchId: "", version: 1 };
let accepted = { batchId: "", version: 1 };

async function storedFile(batchPublicId: string) {
  const [row] = await getDb()
    .select({
      fileKey: batchVersions.fileKey,
      fileUrl: batchVersions.fileUrl,
      fileName: batchVersions.fileName,
    })
    .from(batchVersions)
    .innerJoin(batches, eq(batches.id, batchVersions.batchId))
    .where(eq(batches.publicId, batchPublicId));
  return row!;
}

beforeAll(async () => {
  fakeUrl = (await startFileStore()).url;
  const r = await uploadChecked("provider@fennick.test", {
    study: STUDY,
    label: LABEL,
    file: new File([csv], "fennick.csv", { type: "text/csv" }),
  });
  ready = { batchId: r.batchId, version: r.version };
  const a = await uploadChecked("provider@harrowgate.test", {
    study: STUDY,
    file: new File([csv], "harrowgate.csv", { type: "text/csv" }),
  });
  expect(
    (await decideVersion(await userId("analyst@lowmoor.test"), a.batchId, 1, { decision: "accept" })).ok,
  ).toBe(true);
  accepted = { batchId: a.batchId, version: 1 };
});

afterAll(async () => {
  await stopFileStore();
  await getPool().end();
});

describe("the original file", () => {
  const url = () => `/api/v1/batches/${ready.batchId}/versions/1/file`;
  const params = () => ({ id: ready.batchId, version: "1" });

  it.each(["provider@fennick.test", "analyst@lowmoor.test", "lead@lowmoor.test", "admin@tributary.test"])(
    "is served to %s, byte for byte, as an attachment",
    async (email) => {
      const res = await callAs(fileRoute, url(), params(), email);
      expect(res.status).toBe(200);
      expect(await res.text()).toBe(csv);
      expect(res.headers.get("content-disposition")).toBe(
        `attachment; filename="fennick.csv"; filename*=UTF-8''fennick.csv`,
      );
      expect(res.headers.get("content-type")).toBe("text/csv");
      expect(res.headers.get("cache-control")).toBe("private, no-store");
    },
  );

  it.each(["provider@harrowgate.test", "analyst2@lowmoor.test"])(
    "answers 404 to %s (another organisation; an analyst not assigned)",
    async (email) => {
      const res = await callAs(fileRoute, url(), params(), email);
      expect(res.status).toBe(404);
      expect(((await res.json()) as { code: string }).code).toBe("not_found");
      // the same for the report JSON
      expect(
        (await callAs(reportRoute, `/api/v1/batches/${ready.batchId}/versions/1/report`, params(), email))
          .status,
      ).toBe(404);
    },
  );

  it("answers 401 without a session and 404 for a version or batch that does not exist", async () => {
    expect((await callAs(fileRoute, url(), params(), null)).status).toBe(401);
    expect(
      (
        await callAs(
          fileRoute,
          `/api/v1/batches/${ready.batchId}/versions/2/file`,
          { id: ready.batchId, version: "2" },
          "provider@fennick.test",
        )
      ).status,
    ).toBe(404);
    expect(
      (
        await callAs(
          fileRoute,
          `/api/v1/batches/nope/versions/1/file`,
          { id: "nope", version: "1" },
          "lead@lowmoor.test",
        )
      ).status,
    ).toBe(404);
  });

  it("is private in the store: its raw address, a forged or an expired signature are refused", async () => {
    const f = await storedFile(ready.batchId);
    expect(f.fileUrl.startsWith(fakeUrl)).toBe(true);
    expect((await fetch(f.fileUrl)).status).toBe(403);
    expect((await fetch(`${fakeUrl}/f/${f.fileKey}`)).status).toBe(403);
    expect(
      (
        await fetch(
          `${fakeUrl}/f/${f.fileKey}?expires=${Date.now() + 60_000}&signature=hmac-sha256=${"0".repeat(64)}`,
        )
      ).status,
    ).toBe(403);
    expect(
      (await fetch(`${fakeUrl}/f/${f.fileKey}?expires=1&signature=hmac-sha256=${"0".repeat(64)}`)).status,
    ).toBe(403);
  });

  it("has a key that is not derived from its name and bytes: the same file sent twice is stored under two unrelated keys", async () => {
    const again = await uploadChecked("provider@fennick.test", {
      study: STUDY,
      file: new File([csv], "fennick.csv", { type: "text/csv" }),
    });
    const [k1, k2] = [(await storedFile(ready.batchId)).fileKey, (await storedFile(again.batchId)).fileKey];
    expect(k1).not.toBe(k2);
    expect(k1.length).toBeGreaterThanOrEqual(20);
  });
});

describe("API answers carry no file key or store address", () => {
  it("batch, batches, report, pool, dictionary and if-accepted", async () => {
    const f = await storedFile(ready.batchId);
    const g = await storedFile(accepted.batchId);
    const p = { id: ready.batchId, version: "1" };
    const answers = [
      await callAs(
        batchRoute,
        `/api/v1/batches/${ready.batchId}`,
        { id: ready.batchId },
        "provider@fennick.test",
      ),
      await callAs(batchesRoute, "/api/v1/batches", {}, "lead@lowmoor.test"),
      await callAs(
        reportRoute,
        `/api/v1/batches/${ready.batchId}/versions/1/report`,
        p,
        "analyst@lowmoor.test",
      ),
      await callAs(poolRoute, `/api/v1/pool/${STUDY}`, { slug: STUDY }, "lead@lowmoor.test"),
      await callAs(dictionaryRoute, `/api/v1/pool/${STUDY}/dictionary`, { slug: STUDY }, "lead@lowmoor.test"),
      await callAs(
        ifAcceptedRoute,
        `/api/v1/pool/${STUDY}/if-accepted?batch=${ready.batchId}&version=1`,
        { slug: STUDY },
        "analyst@lowmoor.test",
      ),
    ];
    for (const res of answers) {
      expect(res.status).toBe(200);
      const text = await res.text();
      for (const secret of [
        f.fileKey,
        g.fileKey,
        f.fileUrl,
        fakeUrl,
        "fileKey",
        "fileUrl",
        "file_url",
        "ufsUrl",
      ])
        expect(text).not.toContain(secret);
    }
  });

  it("if-accepted answers 404 to an analyst not assigned and 403 to a provider", async () => {
    const u = `/api/v1/pool/${STUDY}/if-accepted?batch=${ready.batchId}&version=1`;
    expect((await callAs(ifAcceptedRoute, u, { slug: STUDY }, "analyst2@lowmoor.test")).status).toBe(404);
    expect((await callAs(ifAcceptedRoute, u, { slug: STUDY }, "provider@harrowgate.test")).status).toBe(403);
  });
});

describe("e-mails go to the right people, with user-typed text escaped", () => {
  async function orgProviders(slug: string) {
    const [o] = await getDb()
      .select({ id: organisations.id })
      .from(organisations)
      .where(eq(organisations.slug, slug));
    const rows = await getDb()
      .select({ email: users.email })
      .from(users)
      .where(and(eq(users.organisationId, o!.id), eq(users.role, "provider"), eq(users.active, true)));
    return rows.map((r) => r.email).sort();
  }

  it("a decision reaches the batch's organisation's active providers and nobody else", async () => {
    const analyst = await userId("analyst@lowmoor.test");
    const r = await decideVersion(analyst, ready.batchId, 1, {
      decision: "bounce",
      comment: "<script>alert(1)</script> fix the plots",
    });
    expect(r.ok, JSON.stringify(r)).toBe(true);
    const [b] = await getDb()
      .select({ id: batches.id })
      .from(batches)
      .where(eq(batches.publicId, ready.batchId));
    const mails = await getDb()
      .select({ to: emailOutbox.toAddress, html: emailOutbox.htmlBody, subject: emailOutbox.subject })
      .from(emailOutbox)
      .where(and(eq(emailOutbox.kind, "decision"), eq(emailOutbox.batchId, b!.id)));
    const expected = await orgProviders("fennick-hill");
    expect(expected.length).toBeGreaterThan(0);
    expect(mails.map((m) => m.to).sort()).toEqual(expected);
    for (const m of mails) {
      expect(m.html).toContain("&lt;img src=x onerror=alert(1)&gt; plots &quot;spring&quot;");
      expect(m.html).toContain("&lt;script&gt;alert(1)&lt;/script&gt;");
      expect(m.html).not.toMatch(/<img|<script/i);
      expect(m.subject).not.toMatch(/[\r\n]/);
    }
  });

  it("the digest reaches the active leads only, with batch titles escaped", async () => {
    await uploadChecked("provider@fennick.test", {
      study: STUDY,
      label: LABEL,
      file: new File([csv], "waiting.csv", { type: "text/csv" }),
    });
    const lead = await userId("lead@lowmoor.test");
    const sent = await sendDigest({ actorId: lead, reason: "now" });
    expect(sent.ok, JSON.stringify(sent)).toBe(true);
    const mails = await getDb()
      .select({ to: emailOutbox.toAddress, html: emailOutbox.htmlBody })
      .from(emailOutbox)
      .where(eq(emailOutbox.kind, "digest"));
    const leads = (
      await getDb()
        .select({ email: users.email })
        .from(users)
        .where(and(eq(users.role, "lead"), eq(users.active, true)))
    )
      .map((l) => l.email)
      .sort();
    expect(mails.map((m) => m.to).sort()).toEqual(leads);
    const others = await getDb()
      .select({ email: users.email })
      .from(users)
      .where(inArray(users.role, ["provider", "analyst", "admin"]));
    for (const o of others) expect(mails.map((m) => m.to)).not.toContain(o.email);
    for (const m of mails) {
      expect(m.html).toContain("&lt;img src=x onerror=alert(1)&gt;");
      expect(m.html).not.toMatch(/<img/i);
    }
  });
});
