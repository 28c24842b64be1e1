/**
 * Where the load study's batches stand, read straight from the load database (server clock,
 * millisecond timestamps): how many versions were recorded, how many have a stored report,
 * and the times of the last upload and the last report.
 */
import mysql from "mysql2/promise";

export interface CheckProgress {
  versions: number;
  /** versions with at least one stored report */
  reported: number;
  /** reports stored in all (more than `reported` means a version was checked twice) */
  reports: number;
  ready: number;
  unreadable: number;
  /** versions whose state is still received or checking */
  waiting: number;
  firstUploadAt: Date | null;
  lastUploadAt: Date | null;
  lastReportAt: Date | null;
  failedAttempts: number;
}

const SQL = `
  select count(*) as versions,
         sum(r.n > 0) as reported,
         coalesce(sum(r.n), 0) as reports,
         sum(v.state = 'ready') as ready,
         sum(v.state = 'unreadable') as unreadable,
         sum(v.state in ('received', 'checking')) as waiting,
         min(v.created_at) as firstUploadAt,
         max(v.created_at) as lastUploadAt,
         max(r.last_at) as lastReportAt,
         (select count(*) from check_jobs j join batch_versions v2 on v2.id = j.batch_version_id
            join batches b2 on b2.id = v2.batch_id join studies s2 on s2.id = b2.study_id
           where s2.slug = ? and j.last_error is not null) as failedAttempts
    from batch_versions v
    join batches b on b.id = v.batch_id
    join studies s on s.id = b.study_id
    left join (select batch_version_id, count(*) as n, max(created_at) as last_at from reports group by batch_version_id) r
      on r.batch_version_id = v.id
   where s.slug = ?`;

/** A small pool on the load database (one connection is enough for polling). */
export function progressReader(databaseUrl: string, studySlug: string) {
  const pool = mysql.createPool({ uri: databaseUrl, connectionLimit: 1, timezone: "Z", dateStrings: false });
  return {
    async read(): Promise<CheckProgress> {
      const [rows] = await pool.query(SQL, [studySlug, studySlug]);
      const r = (rows as Record<string, unknown>[])[0] ?? {};
      const n = (k: string) => Number(r[k] ?? 0);
      const d = (k: string) => (r[k] instanceof Date ? (r[k] as Date) : null);
      return {
        versions: n("versions"),
        reported: n("reported"),
        reports: n("reports"),
        ready: n("ready"),
        unreadable: n("unreadable"),
        waiting: n("waiting"),
        firstUploadAt: d("firstUploadAt"),
        lastUploadAt: d("lastUploadAt"),
        lastReportAt: d("lastReportAt"),
        failedAttempts: n("failedAttempts"),
      };
    },
    close: () => pool.end(),
  };
}
