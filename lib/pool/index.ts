/**
 * The pool feature: a study's accepted versions combined (pool.ts), its scoped reads and the
 * export audit (queries.ts), the pool kept per study (stored.ts, stored-read.ts), its exports (export.ts), the lead's board (queries-board.ts) and
 * the weekly digest (digest-*.ts). Other features and the app import from here.
 */
export {
  computeStudyPool,
  getIfAccepted,
  getStudyPool,
  getStudyRef,
  loadAccepted,
  loadCurrentPlan,
  poolFigures,
  poolOf,
  withoutState,
  type IfAccepted,
  type PoolFigures,
  type PoolMember,
  type StudyPool,
  type StudyRef,
} from "./pool";
export {
  getIfAcceptedForUser,
  getPoolForUser,
  getPoolStudyForUser,
  listPoolStudiesForUser,
  loadBoard,
  loadPool,
  NO_VISIBLE_POOL,
  recordPoolExport,
} from "./queries";
export {
  dataDictionary,
  dataDictionaryCsv,
  exportFileName,
  poolCsvStream,
  PROVENANCE_COLUMNS,
  type DataDictionary,
  type DictionaryEntry,
  type OpenFile,
} from "./export";
export * from "./queries-board";
export { acceptedInOrder, addToStoredPool, rebuildStoredPool } from "./stored";
export { quantile, weekStart, HOUR_MS } from "./board-stats";
export { composeDigest, digestData, type DigestData } from "./digest-compose";
export { digestDue, runDigestSchedule } from "./digest-schedule";
export { sendDigest, type DigestSent } from "./digest-send";
