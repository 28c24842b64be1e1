/** Sends a CSV through intake and the check worker, with files held in memory (no upload service). */
import { eq, sql } from "drizzle-orm";
import { getDb } from "@/db/client";
import { checkJobs, studies, users } from "@/db/schema";
import { recordBatchVersion } from "@/lib/batches/commands-upload";
import { claimJob } from "@/lib/batches/jobs/check-jobs";
import { runJob } from "@/lib/batches/jobs/worker";

const files = new Map<string, string>();
let seq = 0;

export function streamOf(text: string): ReadableStream<Uint8Array> {
  const bytes = new TextEncoder().encode(text);
  return new ReadableStream({
    start(c) {
      for (let i = 0; i < bytes.length; i += 4096) c.enqueue(bytes.slice(i, i + 4096));
      c.close();
    },
  });
}

export const openMemoryFile = async (key: string) => {
  const text = files.get(key);
  if (text === undefined) throw new Error(`no stored file ${key}`);
  return streamOf(text);
};

export function storeInMemory(csv: string, name = "plots.csv") {
  const key = `mem-${process.pid}-${++seq}`;
  files.set(key, csv);
  return { key, url: `http://127.0.0.1/f/${key}`, name, size: csv.length };
}

export async function userId(email: string): Promise<number> {
  const [u] = await getDb().select({ id: users.id }).from(users).where(eq(users.email, email));
  if (!u) throw new Error(`no user ${email}`);
  return u.id;
}

export async function studyId(slug: string): Promise<number> {
  const [s] = await getDb().select({ id: studies.id }).from(studies).where(eq(studies.slug, slug));
  if (!s) throw new Error(`no study ${slug}`);
  return s.id;
}

/** Marks every open job done, so a test starts from an empty queue. */
export async function drainQueue() {
  await getDb()
    .update(checkJobs)
    .set({ status: "done" })
    .where(sql`${checkJobs.status} in ('queued','running')`);
}

/** Upload `csv` as `email` to `slug` (optionally as a new version) and run its check to the end. */
export async function uploadAndCheck(
  email: string,
  slug: string,
  csv: string,
  opts: { batchPublicId?: string; name?: string } = {},
) {
  const db = getDb();
  await drainQueue();
  const r = await recordBatchVersion(
    await userId(email),
    { studyId: await studyId(slug), batchPublicId: opts.batchPublicId ?? null },
    storeInMemory(csv, opts.name),
  );
  if (!r.ok) throw new Error(r.message);
  const job = await claimJob(db, "test-worker");
  if (!job || job.batchVersionId !== r.data.batchVersionId)
    throw new Error("the new version's job was not claimed");
  const report = await runJob({ db, openFile: openMemoryFile }, job);
  return { ...r.data, report };
}
