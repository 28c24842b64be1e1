/**
 * The world the access walk calls into: helpers/world.ts's two provider organisations and two
 * studies, each study with a checked batch ready for review and an accepted one whose files
 * really sit in the upload-service fake (so exports and downloads answer for real), one
 * session per role, and throwaway objects for the calls that change data.
 */
import { randomBytes } from "node:crypto";
import { mkdtemp, rm } from "node:fs/promises";
import os from "node:os";
import path from "node:path";
import bcrypt from "bcryptjs";
import { eq, inArray, sql } from "drizzle-orm";
import { UTFile } from "uploadthing/server";
import { getDb } from "@/db/client";
import {
  batches,
  batchVersions,
  checkJobs,
  dataPlans,
  organisations,
  reports,
  studies,
  studyAnalysts,
  studyProviders,
  users,
  type UserRole,
} from "@/db/schema";
import { startUploadFake, parseUploadToken } from "@/fakes/upload-service";
import { DEMO_STUDIES, planHash } from "@/lib/demo";
import { barleyBatches } from "@/lib/demo/batches";
import { recordBatchVersion } from "@/lib/batches/commands-upload";
import { claimJob } from "@/lib/batches/jobs/check-jobs";
import { runJob } from "@/lib/batches/jobs/worker";
import { decideVersion } from "@/lib/batches/commands-decide";
import { openStoredFile, utapi } from "@/lib/batches/intake/file-store";
import { drainQueue } from "./pipeline";
import { sessionCookieFor } from "./session";
import { addApiToken, createWorld, WORLD_PASSWORD, type World, type WorldUser } from "./world";
import type { Role } from "./security-walk-table";

export type Side = {
  study: { id: number; slug: string };
  ready: { publicId: string; version: number };
  accepted: { publicId: string; version: number };
};
export type WalkWorld = World & {
  /** the caller of each role; "own" objects are on side A (farm A, study A), "other" ones on side B */
  callers: Record<Exclude<Role, "anonymous">, WorldUser>;
  cookies: Record<Role, string>;
  a: Side;
  b: Side;
};

let fake: Awaited<ReturnType<typeof startUploadFake>> | undefined;
let dir = "";

/** Starts the upload-service fake and points the SDK at it; call before anything reads the environment. */
export async function startWalkFileStore(): Promise<void> {
  dir = await mkdtemp(path.join(os.tmpdir(), "tributary-walk-"));
  const { apiKey } = parseUploadToken(process.env.UPLOADTHING_TOKEN!);
  fake = await startUploadFake({ port: 0, apiKey, dir, log: () => {} });
  process.env.UPLOADTHING_API_URL = fake.url;
  process.env.UPLOADTHING_INGEST_URL = fake.url;
}

export async function stopWalkFileStore(): Promise<void> {
  await fake?.close();
  if (dir) await rm(dir, { recursive: true, force: true });
}

/** A batch stored in the file fake, recorded and checked by the worker's code; optionally accepted. */
async function realBatch(provider: WorldUser, studyId: number, csv: string, accept: WorldUser | null) {
  const db = getDb();
  const name = `walk-${randomBytes(3).toString("hex")}.csv`;
  const stored = await utapi().uploadFiles(new UTFile([csv], name, { type: "text/csv" }), {
    acl: "private",
    contentDisposition: "attachment",
  });
  if (stored.error || !stored.data) throw new Error(`file fake refused the file: ${stored.error?.message}`);
  await drainQueue();
  const r = await recordBatchVersion(
    provider.id,
    { studyId, batchPublicId: null, title: name },
    { key: stored.data.key, url: stored.data.ufsUrl, name, size: csv.length },
  );
  if (!r.ok) throw new Error(r.message);
  const job = await claimJob(db, "security-walk");
  if (job?.batchVersionId !== r.data.batchVersionId)
    throw new Error("the new version's check was not claimed");
  await runJob({ db, openFile: (k) => openStoredFile(k) }, job);
  if (accept) {
    const d = await decideVersion(accept.id, r.data.batchPublicId, r.data.version, { decision: "accept" });
    if (!d.ok) throw new Error(d.message);
  }
  return { publicId: r.data.batchPublicId, version: r.data.version };
}

export async function buildWalkWorld(): Promise<WalkWorld> {
  const w = await createWorld();
  // the world's own batches have no stored file or report: keep them out of the pools
  await getDb()
    .update(batchVersions)
    .set({ state: "bounced" })
    .where(inArray(batchVersions.batchId, [w.batchA.id, w.batchB.id]));
  // the ready one has findings (rows at fault to list); the accepted one is clean
  const [faulty, clean] = [barleyBatches()[1]!.csv, barleyBatches().at(-1)!.csv];
  const side = async (study: World["studyA"], provider: WorldUser): Promise<Side> => ({
    study,
    ready: await realBatch(provider, study.id, faulty, null),
    accepted: await realBatch(provider, study.id, clean, w.users.admin),
  });
  const a = await side(w.studyA, w.users.providerA);
  const b = await side(w.studyB, w.users.providerB);
  const callers = {
    provider: w.users.providerA,
    analyst: w.users.analystA,
    lead: w.users.lead,
    admin: w.users.admin,
  };
  const cookies: Record<Role, string> = { anonymous: "", provider: "", analyst: "", lead: "", admin: "" };
  for (const [role, u] of Object.entries(callers)) cookies[role as Role] = await sessionCookieFor(u);
  return { ...w, callers, cookies, a, b };
}

let seq = 0;
const tag = () => `${process.pid}-${++seq}-${randomBytes(2).toString("hex")}`;
const HASH = bcrypt.hashSync(WORLD_PASSWORD, 4);

/** A throwaway active user of `role` (providers in farm A, the others in the team), password WORLD_PASSWORD. */
export async function freshUser(w: WalkWorld, role: UserRole): Promise<WorldUser & { cookie: string }> {
  const email = `walk-${role}-${tag()}@f3a.test`;
  const organisationId = role === "provider" ? w.farmA.id : w.team.id;
  const [row] = await getDb()
    .insert(users)
    .values({ email, name: `Walk ${role}`, role, organisationId, passwordHash: HASH, active: true })
    .$returningId();
  const u = { id: row!.id, email, name: `Walk ${role}`, role, organisationId, sessionVersion: 1 };
  return { ...u, cookie: await sessionCookieFor(u) };
}

/** A throwaway provider organisation (for admitting to a study). */
export async function freshFarm(): Promise<number> {
  const t = tag();
  const [row] = await getDb()
    .insert(organisations)
    .values({ name: `Walk farm ${t}`, slug: `walk-farm-${t}`, kind: "provider" })
    .$returningId();
  return row!.id;
}

/** A throwaway open study with the barley plan; `own` admits farm A and assigns analyst A (as side A), else farm B and analyst B. */
export async function freshStudy(w: WalkWorld, own: boolean): Promise<{ id: number; slug: string }> {
  const db = getDb();
  const slug = `walk-study-${tag()}`;
  const [row] = await db
    .insert(studies)
    .values({ slug, title: `Walk ${slug}`, teamOrganisationId: w.team.id })
    .$returningId();
  const plan = DEMO_STUDIES[0]!.plan;
  await db.insert(dataPlans).values({ studyId: row!.id, version: 1, plan, planHash: planHash(plan) });
  await db.update(studies).set({ currentPlanVersion: 1 }).where(eq(studies.id, row!.id));
  await db
    .insert(studyAnalysts)
    .values({ studyId: row!.id, userId: own ? w.users.analystA.id : w.users.analystB.id });
  await db.insert(studyProviders).values({ studyId: row!.id, organisationId: own ? w.farmA.id : w.farmB.id });
  return { id: row!.id, slug };
}

/** A throwaway version ready for review in study A (own) or B (other); or, with `failed`, one whose check job failed. */
/** The finding code of the report freshVersion(…, "with a finding") stores. */
export const WALK_FINDING = "level.variant";

export async function freshVersion(
  w: WalkWorld,
  own: boolean,
  job?: "failed" | "with a finding",
): Promise<{ publicId: string; version: number; jobId?: number }> {
  const db = getDb();
  const study = own ? w.studyA : w.studyB;
  const uploader = own ? w.users.providerA : w.users.providerB;
  const publicId = `w${randomBytes(7).toString("hex")}`;
  const [b] = await db
    .insert(batches)
    .values({
      publicId,
      studyId: study.id,
      organisationId: uploader.organisationId!,
      title: `Walk ${publicId}`,
      latestVersion: 1,
      createdById: uploader.id,
    })
    .$returningId();
  const [plan] = await db.select({ id: dataPlans.id }).from(dataPlans).where(eq(dataPlans.studyId, study.id));
  const [v] = await db
    .insert(batchVersions)
    .values({
      batchId: b!.id,
      version: 1,
      planId: plan!.id,
      fileKey: `walk-${publicId}`,
      fileUrl: `http://127.0.0.1/f/walk-${publicId}`,
      fileName: `${publicId}.csv`,
      fileSize: 10,
      state: job ? "checking" : "ready",
      uploadedById: uploader.id,
    })
    .$returningId();
  if (job === "with a finding") {
    // a stored report with one finding, for the routes that comment on findings
    await db.insert(reports).values({
      batchVersionId: v!.id,
      planId: plan!.id,
      status: "checked",
      engineVersion: "walk",
      report: { findings: [{ code: WALK_FINDING, severity: "warning", columns: [], message: "walk" }] },
    });
  }
  if (job !== "failed") return { publicId, version: 1 };
  const [j] = await db
    .insert(checkJobs)
    .values({
      batchVersionId: v!.id,
      status: "failed",
      attempts: 3,
      lastError: "walk: a failed check",
      finishedAt: new Date(),
    })
    .$returningId();
  return { publicId, version: 1, jobId: j!.id };
}

/** A fresh API token of `user` (own) or of provider B (other); its id. */
export async function freshToken(w: WalkWorld, user: WorldUser, own: boolean): Promise<number> {
  return (await addApiToken(own ? user : w.users.providerB)).id;
}

const TABLES = [
  "users",
  "organisations",
  "studies",
  "data_plans",
  "study_analysts",
  "study_providers",
  "batches",
  "batch_versions",
  "check_jobs",
  "reports",
  "decisions",
  "finding_comments",
  "api_tokens",
  "user_tokens",
  "email_outbox",
  "audit_events",
];

/** A checksum of every table a call could change (MariaDB's CHECKSUM TABLE over all rows). */
export async function dataSnapshot(): Promise<string> {
  const [rows] = (await getDb().execute(sql.raw(`CHECKSUM TABLE ${TABLES.join(", ")}`))) as unknown as [
    { Table: string; Checksum: string | number }[],
  ];
  return rows.map((r) => `${r.Table}=${r.Checksum}`).join(" ");
}
