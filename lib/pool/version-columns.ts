/** The columns naming an accepted batch version in the pool's reads (pool, stored pool, questions). */
import { batches, batchVersions, organisations } from "@/db/schema";
import type { PoolMember } from "./pool";

export type VersionRow = Pick<
  PoolMember,
  | "batchVersionId"
  | "batchId"
  | "batchPublicId"
  | "batchTitle"
  | "version"
  | "organisationId"
  | "organisationName"
  | "fileKey"
  | "fileName"
>;

export const versionColumns = {
  batchVersionId: batchVersions.id,
  batchId: batches.id,
  batchPublicId: batches.publicId,
  batchTitle: batches.title,
  version: batchVersions.version,
  organisationId: organisations.id,
  organisationName: organisations.name,
  fileKey: batchVersions.fileKey,
  fileName: batchVersions.fileName,
};
