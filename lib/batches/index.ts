/**
 * The batches feature: what providers send and analysts decide. Reads scoped to the user
 * (queries*.ts), the writes (commands-*.ts, through lib/core/write.ts), the upload paths and
 * the file store (intake/), the check queue and its worker loop (jobs/). Other features and
 * the app's server code import from here; browser code imports schemas.ts and the intake
 * modules it needs (file rules, upload errors) directly.
 */
export { decideVersion, type DecisionDone } from "./commands-decide";
export {
  authoriseUpload,
  newPublicId,
  recordBatchVersion,
  type StoredFile,
  type UploadTarget,
} from "./commands-upload";
export { decisionInput, type DecisionInput } from "./schemas";
export {
  getBatchForUser,
  listBatchesForUser,
  type BatchDetail,
  type BatchSummary,
  type BatchVersionSummary,
} from "./queries";
export { getHomeSummary, type HomeSummary, type StateCounts } from "./queries-home";
export { listOpenCheckJobs, type CheckJobItem } from "./queries-jobs";
export { listQueueForUser, QUEUE_STATES, type QueueItem } from "./queries-queue";
export { getVersionFileKeyForUser, getVersionReportForUser, type VersionReport } from "./queries-reports";
export { getBatchTrailForUser, type TrailEntry } from "./queries-trail";
export { getVersionChangesForUser, getVersionFixForUser, type VersionFixView } from "./queries-fixes";
export { listUploadTargets } from "./queries-upload-targets";
export { retryFailedJob } from "./commands-jobs";
export { openStoredFile, StoredFileMissingError, utapi } from "./intake/file-store";
