/**
 * What the scale run reads from MariaDB itself: replication lag (the time until the replica has
 * applied the primary's latest transaction, by GTID, sampled every second), how many SELECTs
 * each server ran (Com_select), and the after-run checks — one batch and one version per
 * provider, one report per accepted upload, every decision with its audit row, every e-mail once.
 */
import mysql from "mysql2/promise";

const seqOf = (gtid: unknown) =>
  Math.max(
    0,
    ...String(gtid ?? "")
      .split(",")
      .map((g) => Number(g.split("-")[2] ?? 0)),
  );
const pause = (ms: number) => new Promise((r) => setTimeout(r, ms));

export function openServer(url: string): mysql.Pool {
  return mysql.createPool({ uri: url, connectionLimit: 2, connectTimeout: 2000, timezone: "Z" });
}

/** Replication lag in ms every second (null while either server does not answer). */
export function sampleLag(primary: mysql.Pool, replica: mysql.Pool) {
  const samples: { at: number; ms: number | null }[] = [];
  let stopped = false;
  const run = (async () => {
    while (!stopped) {
      const at = Date.now();
      let ms: number | null = null;
      try {
        const [[p]] = (await primary.query("SELECT @@gtid_binlog_pos AS g")) as unknown as [{ g: string }[]];
        const target = seqOf(p?.g);
        for (let i = 0; i < 600 && !stopped; i++) {
          const [[r]] = (await replica.query("SELECT @@gtid_slave_pos AS g")) as unknown as [{ g: string }[]];
          if (seqOf(r?.g) >= target) {
            ms = Date.now() - at;
            break;
          }
          await pause(50);
        }
      } catch {
        ms = null;
      }
      samples.push({ at, ms });
      await pause(Math.max(0, 1000 - (Date.now() - at)));
    }
  })();
  return {
    samples,
    async stop() {
      stopped = true;
      await run;
    },
  };
}

export async function selects(pool: mysql.Pool): Promise<number | null> {
  try {
    const [rows] = await pool.query("SHOW GLOBAL STATUS LIKE 'Com_select'");
    return Number((rows as { Value: string }[])[0]?.Value ?? NaN);
  } catch {
    return null;
  }
}

export interface AfterChecks {
  batches: number;
  versions: number;
  versionsWithoutOneReport: number;
  orgsWithMoreThanOneBatch: number;
  decisions: number;
  decisionsWithoutAudit: number;
  outboxRows: number;
  outboxSent: number;
  mailboxMessages: number;
  mailsSentTwice: number;
  checkJobsTakenOver: number;
  /** e-mails that needed more than one attempt (a failed round, an expired claim) */
  mailsRetried: number;
  /** when the last decision was recorded and the last e-mail sent (to explain the run's tail) */
  lastDecisionAt: Date | null;
  lastMailSentAt: Date | null;
}

export async function afterChecks(
  pool: mysql.Pool,
  studySlug: string,
  mailboxUrl: string,
): Promise<AfterChecks> {
  const one = async (sql: string) => {
    const [rows] = await pool.query(sql, [studySlug]);
    return Number(Object.values((rows as Record<string, unknown>[])[0] ?? {})[0] ?? 0);
  };
  const when = async (sql: string): Promise<Date | null> => {
    const [rows] = await pool.query(sql, [studySlug]);
    const v = Object.values((rows as Record<string, unknown>[])[0] ?? {})[0];
    return v instanceof Date ? v : v ? new Date(String(v)) : null;
  };
  const inStudy = `join batches b on b.id = v.batch_id join studies s on s.id = b.study_id and s.slug = ?`;
  const { messages } = (await (await fetch(`${mailboxUrl}/messages`)).json()) as {
    messages: { to: string[]; subject: string }[];
  };
  const keys = messages.map((m) => `${m.to.join(",")}|${m.subject}`);
  return {
    batches: await one(`select count(*) from batches b join studies s on s.id = b.study_id and s.slug = ?`),
    versions: await one(`select count(*) from batch_versions v ${inStudy}`),
    versionsWithoutOneReport: await one(
      `select count(*) from batch_versions v ${inStudy} where (select count(*) from reports r where r.batch_version_id = v.id) <> 1`,
    ),
    orgsWithMoreThanOneBatch: await one(
      `select count(*) from (select b.organisation_id from batches b join studies s on s.id = b.study_id and s.slug = ? group by b.organisation_id having count(*) > 1) x`,
    ),
    decisions: await one(
      `select count(*) from decisions d join batch_versions v on v.id = d.batch_version_id ${inStudy}`,
    ),
    decisionsWithoutAudit: await one(
      `select count(*) from decisions d join batch_versions v on v.id = d.batch_version_id ${inStudy}
        where not exists (select 1 from audit_events a where a.batch_id = b.id and a.action in ('batch.accept', 'batch.bounce'))`,
    ),
    outboxRows: await one(
      `select count(*) from email_outbox o join batches b on b.id = o.batch_id join studies s on s.id = b.study_id and s.slug = ?`,
    ),
    outboxSent: await one(
      `select count(*) from email_outbox o join batches b on b.id = o.batch_id join studies s on s.id = b.study_id and s.slug = ? where o.status = 'sent'`,
    ),
    mailboxMessages: messages.length,
    mailsSentTwice: keys.length - new Set(keys).size,
    checkJobsTakenOver: await one(
      `select count(*) from check_jobs j join batch_versions v on v.id = j.batch_version_id ${inStudy} where j.attempts > 1`,
    ),
    mailsRetried: await one(
      `select count(*) from email_outbox o join batches b on b.id = o.batch_id join studies s on s.id = b.study_id and s.slug = ? where o.attempts > 1`,
    ),
    lastDecisionAt: await when(
      `select max(d.created_at) from decisions d join batch_versions v on v.id = d.batch_version_id ${inStudy}`,
    ),
    lastMailSentAt: await when(
      `select max(o.sent_at) from email_outbox o join batches b on b.id = o.batch_id join studies s on s.id = b.study_id and s.slug = ?`,
    ),
  };
}
