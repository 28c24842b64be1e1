/**
 * Retry-safe uploads (issue 13: "clients see at most retried requests, no upload half-recorded"):
 * POST /api/v1/batches with `Idempotency-Key` (IETF HTTPAPI draft "The Idempotency-Key HTTP Header
 * Field": the key names one request; a repeat answers what the first made; a key reused with another
 * payload is refused with 422; a malformed key with 400). Through the real route and the upload fake.
 */
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { and, eq } from "drizzle-orm";
import { getDb, getPool } from "@/db/client";
import { batches, batchVersions } from "@/db/schema";
import { barleyBatches } from "@/lib/demo/batches";
import { apiUpload, startFileStore, stopFileStore } from "./helpers/security-world";
import { releaseScratchStudy, scratchStudy } from "./helpers/seeded";
import { userId } from "./helpers/pipeline";

const SLUG = `idem-${process.pid}`;
const HARROW = barleyBatches()[0]!.csv;
const file = (csv = HARROW) => new File([csv], "harrowgate.csv", { type: "text/csv" });
const send = (key: string | null, csv = HARROW, email = "provider@harrowgate.test", batch?: string) =>
  apiUpload(
    email,
    { study: SLUG, file: file(csv), ...(batch ? { batch } : {}) },
    key === null ? {} : { "Idempotency-Key": key },
  );

async function versionsWithKey(email: string, key: string) {
  return getDb()
    .select({ id: batchVersions.id })
    .from(batchVersions)
    .where(and(eq(batchVersions.uploadedById, await userId(email)), eq(batchVersions.idempotencyKey, key)));
}

async function batchCount() {
  const [s] = await getDb().execute(
    `SELECT COUNT(*) AS n FROM batches b JOIN studies s ON s.id = b.study_id WHERE s.slug = '${SLUG}'`,
  );
  return Number((s as unknown as { n: number }[])[0]!.n);
}

beforeAll(async () => {
  await startFileStore();
  await scratchStudy(SLUG, { title: `Idempotency test ${SLUG}` });
});

afterAll(async () => {
  await releaseScratchStudy(SLUG);
  await stopFileStore();
  await getPool().end();
});

describe("Idempotency-Key on uploads", () => {
  it("a retry with the same key answers the first version again: one batch, one version", async () => {
    const key = `"harrow-${process.pid}-1"`;
    const first = await send(key);
    expect(first.status).toBe(201);
    expect(first.headers.get("idempotent-replayed")).toBeNull();
    const again = await send(key);
    expect(again.status).toBe(201);
    expect(again.headers.get("idempotent-replayed")).toBe("true");
    expect(again.body.data).toMatchObject({ batchId: first.body.data!.batchId, version: 1 });
    expect(again.headers.get("location")).toBe(first.headers.get("location"));
    expect(await versionsWithKey("provider@harrowgate.test", `harrow-${process.pid}-1`)).toHaveLength(1);
    expect(await batchCount()).toBe(1);
    // without a key the same bytes are a new batch, as before
    expect((await send(null)).status).toBe(201);
    expect(await batchCount()).toBe(2);
  });

  it("two attempts with one key at once make one version, and both are told which", async () => {
    const key = `harrow-${process.pid}-race`;
    const [a, b] = await Promise.all([send(key), send(key)]);
    expect([a.status, b.status]).toEqual([201, 201]);
    expect(a.body.data!.batchId).toBe(b.body.data!.batchId);
    expect(await versionsWithKey("provider@harrowgate.test", key)).toHaveLength(1);
    expect([a, b].filter((r) => r.headers.get("idempotent-replayed") === "true")).toHaveLength(1);
  });

  it("a key reused for other bytes is refused (422) with what to do; nothing is recorded", async () => {
    const key = `harrow-${process.pid}-2`;
    const first = await send(key);
    expect(first.status).toBe(201);
    const before = await batchCount();
    const other = await send(key, HARROW.replace(/\n[^\n]+\n?$/, "\n"));
    expect(other.status).toBe(422);
    expect(other.body.code).toBe("invalid");
    expect(other.body.detail).toContain("used for another upload");
    expect(other.body.detail).toContain("send a new key");
    expect(await batchCount()).toBe(before);
    // the same key of another person is theirs: keys are per uploader
    const fennick = await send(key, barleyBatches()[1]!.csv, "provider@fennick.test");
    expect(fennick.status).toBe(201);
    expect(fennick.headers.get("idempotent-replayed")).toBeNull();
  });

  it("a resubmission with a key: the retry answers version 2, not a version 3", async () => {
    const made = await send(null);
    const batch = made.body.data!.batchId;
    const key = `harrow-${process.pid}-v2`;
    const v2 = await send(key, HARROW, "provider@harrowgate.test", batch);
    const retry = await send(key, HARROW, "provider@harrowgate.test", batch);
    expect(v2.body.data).toMatchObject({ batchId: batch, version: 2 });
    expect(retry.body.data).toMatchObject({ batchId: batch, version: 2 });
    const [row] = await getDb()
      .select({ latest: batches.latestVersion })
      .from(batches)
      .where(eq(batches.publicId, batch));
    expect(row!.latest).toBe(2);
  });

  it("a malformed key is refused (400) with what a key looks like", async () => {
    for (const bad of ["has space", "x".repeat(201), '"unclosed', "é-accent"]) {
      const r = await send(bad);
      expect(r.status, bad).toBe(400);
      expect(r.body.detail).toContain("Idempotency-Key must be 1 to 200 visible ASCII characters");
    }
  });
});
