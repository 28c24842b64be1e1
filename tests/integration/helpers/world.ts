/**
 * A small world of our own for the auth and API tests, written next to the demo seed with
 * unique names, so tests can deactivate, demote and count without touching demo accounts
 * or other test files: one team, two provider organisations, two studies, one user per role
 * (plus a second analyst and a second provider), and one batch per provider organisation.
 */
import { randomBytes } from "node:crypto";
import bcrypt from "bcryptjs";
import { eq } from "drizzle-orm";
import { getDb } from "@/db/client";
import {
  apiTokens,
  batches,
  batchVersions,
  dataPlans,
  organisations,
  studies,
  studyAnalysts,
  studyProviders,
  users,
  type UserRole,
} from "@/db/schema";
import { generateApiToken } from "@/lib/auth/api-tokens";
import { DEMO_STUDIES, planHash } from "@/lib/demo";

export const WORLD_PASSWORD = "correct-horse-battery";

export type WorldUser = {
  id: number;
  email: string;
  name: string;
  role: UserRole;
  organisationId: number | null;
  sessionVersion: number;
};

export type World = {
  tag: string;
  team: { id: number };
  farmA: { id: number; name: string };
  farmB: { id: number; name: string };
  studyA: { id: number; slug: string };
  studyB: { id: number; slug: string };
  users: {
    admin: WorldUser;
    lead: WorldUser;
    analystA: WorldUser;
    analystB: WorldUser;
    providerA: WorldUser;
    providerB: WorldUser;
  };
  batchA: { id: number; publicId: string };
  batchB: { id: number; publicId: string };
  /** One more batch with a single version in `state`, uploaded by `uploader`. */
  addBatch: (
    studyId: number,
    organisationId: number,
    uploader: WorldUser,
    state: "ready" | "accepted",
  ) => Promise<{ id: number; publicId: string; versionId: number }>;
};

// bcrypt cost 4 keeps the fixtures fast; the sign-in code reads the cost from the hash
const HASH = bcrypt.hashSync(WORLD_PASSWORD, 4);

async function addUser(
  tag: string,
  key: string,
  role: UserRole,
  organisationId: number | null,
): Promise<WorldUser> {
  const email = `${key}.${tag}@f3a.test`;
  const name = `${key} ${tag}`;
  const [row] = await getDb()
    .insert(users)
    .values({ email, name, role, organisationId, passwordHash: HASH, active: true })
    .$returningId();
  if (!row) throw new Error("no user id");
  return { id: row.id, email, name, role, organisationId, sessionVersion: 1 };
}

export async function createWorld(): Promise<World> {
  const db = getDb();
  const tag = randomBytes(4).toString("hex");
  const org = async (name: string, kind: "provider" | "team") => {
    const [row] = await db
      .insert(organisations)
      .values({ name: `${name} ${tag}`, slug: `${name.toLowerCase().replace(/\s+/g, "-")}-${tag}`, kind })
      .$returningId();
    if (!row) throw new Error("no organisation id");
    return { id: row.id, name: `${name} ${tag}` };
  };
  const team = await org("Test Team", "team");
  const farmA = await org("Farm A", "provider");
  const farmB = await org("Farm B", "provider");

  const u = {
    admin: await addUser(tag, "admin", "admin", team.id),
    lead: await addUser(tag, "lead", "lead", team.id),
    analystA: await addUser(tag, "analyst-a", "analyst", team.id),
    analystB: await addUser(tag, "analyst-b", "analyst", team.id),
    providerA: await addUser(tag, "provider-a", "provider", farmA.id),
    providerB: await addUser(tag, "provider-b", "provider", farmB.id),
  };

  const study = async (slug: string) => {
    const [row] = await db
      .insert(studies)
      .values({ slug: `${slug}-${tag}`, title: `Study ${slug} ${tag}`, teamOrganisationId: team.id })
      .$returningId();
    if (!row) throw new Error("no study id");
    // a real, valid plan (the demo barley plan), so code that parses every study's plan is not upset by ours
    const plan = DEMO_STUDIES[0]!.plan;
    await db.insert(dataPlans).values({ studyId: row.id, version: 1, plan, planHash: planHash(plan) });
    await db.update(studies).set({ currentPlanVersion: 1 }).where(eq(studies.id, row.id));
    return { id: row.id, slug: `${slug}-${tag}` };
  };
  const studyA = await study("a");
  const studyB = await study("b");
  // analyst A reviews study A only; analyst B study B only; farm A supplies A, farm B supplies B
  await db.insert(studyAnalysts).values([
    { studyId: studyA.id, userId: u.analystA.id },
    { studyId: studyB.id, userId: u.analystB.id },
  ]);
  await db.insert(studyProviders).values([
    { studyId: studyA.id, organisationId: farmA.id },
    { studyId: studyB.id, organisationId: farmB.id },
  ]);

  const batch = async (
    studyId: number,
    organisationId: number,
    uploader: WorldUser,
    state: "ready" | "accepted",
  ) => {
    const publicId = `t${tag}${randomBytes(6).toString("hex")}`;
    const [row] = await db
      .insert(batches)
      .values({
        publicId,
        studyId,
        organisationId,
        title: `Batch ${publicId}`,
        latestVersion: 1,
        createdById: uploader.id,
      })
      .$returningId();
    if (!row) throw new Error("no batch id");
    const [plan] = await db
      .select({ id: dataPlans.id })
      .from(dataPlans)
      .where(eq(dataPlans.studyId, studyId));
    const [ver] = await db
      .insert(batchVersions)
      .values({
        batchId: row.id,
        version: 1,
        planId: plan!.id,
        fileKey: `key-${publicId}`,
        fileUrl: `http://127.0.0.1:3411/f/key-${publicId}`,
        fileName: `${publicId}.csv`,
        fileSize: 1234,
        state,
        uploadedById: uploader.id,
      })
      .$returningId();
    return { id: row.id, publicId, versionId: ver!.id };
  };
  const batchA = await batch(studyA.id, farmA.id, u.providerA, "ready");
  const batchB = await batch(studyB.id, farmB.id, u.providerB, "accepted");

  return { tag, team, farmA, farmB, studyA, studyB, users: u, batchA, batchB, addBatch: batch };
}

/** Inserts an API token for `user` directly and returns its value. */
export async function addApiToken(
  user: WorldUser,
  opts: { revoked?: boolean } = {},
): Promise<{ id: number; token: string }> {
  const { token, hash, prefix } = generateApiToken();
  const [row] = await getDb()
    .insert(apiTokens)
    .values({
      userId: user.id,
      name: "test token",
      tokenHash: hash,
      prefix,
      revokedAt: opts.revoked ? new Date() : null,
    })
    .$returningId();
  if (!row) throw new Error("no token id");
  return { id: row.id, token };
}
