/** The board's providers: each organisation's batches and decisions, and who has sent nothing yet. */
import { and, eq, isNull, sql } from "drizzle-orm";
import type { Db } from "@/db/client";
import { batches, batchVersions, decisions, organisations, studies, studyProviders } from "@/db/schema";

export type ProviderStats = {
  studySlug: string;
  studyTitle: string;
  organisationName: string;
  batches: number;
  versions: number;
  versionsPerBatch: number | null;
  accepted: number;
  bounced: number;
  /** bounces over decisions; null before the first decision */
  bounceRate: number | null;
};

/** Per study and provider organisation: batches, versions per batch, and the share of decisions that were bounces. */
export async function providerStats(db: Db): Promise<ProviderStats[]> {
  const rows = await db
    .select({
      studySlug: studies.slug,
      studyTitle: studies.title,
      organisationName: organisations.name,
      batches: sql<number>`count(distinct ${batches.id})`,
      versions: sql<number>`count(${batchVersions.id})`,
      accepted: sql<number>`sum(case when ${decisions.decision} = 'accept' then 1 else 0 end)`,
      bounced: sql<number>`sum(case when ${decisions.decision} = 'bounce' then 1 else 0 end)`,
    })
    .from(batches)
    .innerJoin(studies, eq(studies.id, batches.studyId))
    .innerJoin(organisations, eq(organisations.id, batches.organisationId))
    .leftJoin(batchVersions, eq(batchVersions.batchId, batches.id))
    .leftJoin(decisions, eq(decisions.batchVersionId, batchVersions.id))
    .groupBy(studies.slug, studies.title, organisations.name)
    .orderBy(studies.title, organisations.name);
  return rows.map((r) => {
    const b = Number(r.batches);
    const v = Number(r.versions);
    const acc = Number(r.accepted ?? 0);
    const bo = Number(r.bounced ?? 0);
    return {
      ...r,
      batches: b,
      versions: v,
      versionsPerBatch: b ? v / b : null,
      accepted: acc,
      bounced: bo,
      bounceRate: acc + bo ? bo / (acc + bo) : null,
    };
  });
}

export type SilentProvider = {
  studySlug: string;
  studyTitle: string;
  organisationName: string;
  admittedAt: Date;
};

/** Provider organisations admitted to a study that have sent no batch to it yet. */
export async function silentProviders(db: Db): Promise<SilentProvider[]> {
  return db
    .select({
      studySlug: studies.slug,
      studyTitle: studies.title,
      organisationName: organisations.name,
      admittedAt: studyProviders.createdAt,
    })
    .from(studyProviders)
    .innerJoin(studies, eq(studies.id, studyProviders.studyId))
    .innerJoin(organisations, eq(organisations.id, studyProviders.organisationId))
    .leftJoin(
      batches,
      and(
        eq(batches.studyId, studyProviders.studyId),
        eq(batches.organisationId, studyProviders.organisationId),
      ),
    )
    .where(isNull(batches.id))
    .orderBy(studies.title, organisations.name);
}
