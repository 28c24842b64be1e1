/**
 * Uploads whose file names carry path tricks, markup, control characters, a right-to-left
 * override or sheer length, through POST /api/v1/batches: the stored name is the cleaned
 * base name (lib/batches/intake/file-rules.ts cleanFileName), the batch title made from it carries
 * no control characters, the JSON shows the cleaned name, and the original-file download
 * names it in a Content-Disposition header with nothing that could break out of it.
 */
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { eq } from "drizzle-orm";
import { getDb, getPool } from "@/db/client";
import { batches, batchVersions } from "@/db/schema";
import { barleyBatches } from "@/lib/demo/batches";
import { GET as batchRoute } from "@/app/api/v1/batches/[id]/route";
import { GET as fileRoute } from "@/app/api/v1/batches/[id]/versions/[version]/file/route";
import { apiUpload, callAs, startFileStore, stopFileStore } from "./helpers/security-world";

const csv = barleyBatches()[0]!.csv;
// RFC 6266 §4.1 token/quoted-string fallback, then RFC 8187 ext-value with attr-chars only
const SAFE_DISPOSITION =
  /^attachment; filename="[A-Za-z0-9._-]+"; filename\*=UTF-8''[A-Za-z0-9!#$&+.^_`|~%-]+$/;

const CASES: [string, string][] = [
  ["../../etc/passwd.csv", "passwd.csv"],
  ["..\\..\\windows\\x.csv", "x.csv"],
  ["<img src=x onerror=alert(1)>.csv", "_img src=x onerror=alert(1)_.csv"],
  ["report\u202Evsc.csv", "reportvsc.csv"],
  ["\u200Bzero\uFEFFwidth.csv", "zerowidth.csv"],
  ['say "hi"; x=1.csv', "say _hi_; x=1.csv"],
  ["CON.csv", "_CON.csv"],
];

beforeAll(async () => {
  await startFileStore();
});

afterAll(async () => {
  await stopFileStore();
  await getPool().end();
});

describe("hostile file names through the API", () => {
  it.each(CASES)("%j is stored as %j and downloaded under a safe header", async (given, stored) => {
    const up = await apiUpload("provider@fennick.test", {
      study: "barley-nitrogen",
      file: new File([csv], given, { type: "text/csv" }),
    });
    expect(up.status, JSON.stringify(up.body)).toBe(201);
    const id = up.body.data!.batchId;
    const [row] = await getDb()
      .select({ fileName: batchVersions.fileName, title: batches.title })
      .from(batchVersions)
      .innerJoin(batches, eq(batches.id, batchVersions.batchId))
      .where(eq(batches.publicId, id));
    expect(row!.fileName).toBe(stored);
    expect(row!.title).toBe(stored.replace(/\.csv$/, ""));
    expect(row!.title).not.toMatch(/[\u0000-\u001f\u007f\u202a-\u202e\u2066-\u2069]/);

    const json = (await (
      await callAs(batchRoute, `/api/v1/batches/${id}`, { id }, "provider@fennick.test")
    ).json()) as { data: { versions: { fileName: string }[] } };
    expect(json.data.versions[0]!.fileName).toBe(stored);

    const res = await callAs(
      fileRoute,
      `/api/v1/batches/${id}/versions/1/file`,
      { id, version: "1" },
      "provider@fennick.test",
    );
    expect(res.status).toBe(200);
    const cd = res.headers.get("content-disposition")!;
    expect(cd).toMatch(SAFE_DISPOSITION);
    // the UTF-8 name decodes back to the stored name
    expect(decodeURIComponent(cd.split("''")[1]!)).toBe(stored);
    expect(await res.text()).toBe(csv);
  });

  // lib/batches/intake/api-upload.ts cleans with upload-router.ts's own cleanFileName, which cuts at 255
  // characters and so drops the extension: this case needs it to use file-rules' cleanFileName
  it("a 1000-character name keeps its extension and is stored at 200 characters", async () => {
    const up = await apiUpload("provider@fennick.test", {
      study: "barley-nitrogen",
      file: new File([csv], `${"a".repeat(1000)}.csv`, { type: "text/csv" }),
    });
    expect(up.status, up.body.detail?.slice(0, 80)).toBe(201);
    const [row] = await getDb()
      .select({ fileName: batchVersions.fileName })
      .from(batchVersions)
      .innerJoin(batches, eq(batches.id, batchVersions.batchId))
      .where(eq(batches.publicId, up.body.data!.batchId));
    expect(row!.fileName).toBe(`${"a".repeat(196)}.csv`);
  });

  // multipart part headers may not carry control characters (RFC 7230 §3.2 field-value), so the
  // streaming reader refuses such a part with a message (the browser route stores them cleaned)
  it.each(["plots\u0007\u001b[31m.csv", "nul\u0000byte.csv", "del\u007f.csv"])(
    "%j is refused before storing, saying to rename the file",
    async (given) => {
      const up = await apiUpload("provider@fennick.test", {
        study: "barley-nitrogen",
        file: new File([csv], given, { type: "text/csv" }),
      });
      expect(up.status).toBe(422);
      expect(up.body.detail).toMatch(/control characters.*Rename the file/);
    },
  );

  it("a name that is nothing but dots and slashes is refused, saying to send a CSV file", async () => {
    const up = await apiUpload("provider@fennick.test", {
      study: "barley-nitrogen",
      file: new File([csv], "../..", { type: "text/csv" }),
    });
    // no extension left: not a CSV file (415, RFC 9110 §15.5.16), with a message naming what to send
    expect(up.status).toBe(415);
    expect(up.body.detail).toMatch(/not a CSV file/);
  });
});
