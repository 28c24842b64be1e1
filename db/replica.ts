/**
 * Reads that a read replica may serve (db/client.ts `getReadDb`): a client with the two methods
 * Drizzle's mysql2 session calls, `query` and `execute`, that sends each statement to the replica
 * while the replica is usable and to the primary otherwise. Usable means: it answers, both
 * replication threads run, and it is at most `maxLagS` seconds behind (Seconds_Behind_Master).
 * The state is checked at most once per `intervalMs`, on the reads themselves (no timer); a read
 * that finds the replica gone is sent again to the primary at once, so a stopped replica costs
 * the caller one refused connection, never an error. Transactions (`getConnection`) always
 * use the primary.
 */
import type mysql from "mysql2/promise";
import { isDbUnavailable } from "./errors";

export interface ReplicaState {
  usable: boolean;
  /** seconds behind the primary at the last check (null when unknown) */
  lagS: number | null;
  /** why reads go to the primary (empty while the replica is usable) */
  reason: string;
  /** Date.now() of the last check (0: never checked) */
  checkedAt: number;
  /** reads served by the replica and by the primary since start */
  readsOnReplica: number;
  readsOnPrimary: number;
}

type SlaveStatus = {
  Slave_IO_Running?: string;
  Slave_SQL_Running?: string;
  Seconds_Behind_Master?: number | string | null;
};

const message = (e: unknown) => (e instanceof Error ? e.message : String(e));

export class ReplicaRouter {
  private state: ReplicaState = {
    usable: false,
    lagS: null,
    reason: "not checked yet",
    checkedAt: 0,
    readsOnReplica: 0,
    readsOnPrimary: 0,
  };
  private probing: Promise<void> | null = null;

  constructor(
    private readonly primary: mysql.Pool,
    private readonly replica: mysql.Pool,
    private readonly maxLagS: number,
    private readonly log: (line: string) => void,
    private readonly intervalMs = 1000,
  ) {}

  status(): ReplicaState {
    return { ...this.state };
  }

  /** Asks the replica how it stands (SHOW SLAVE STATUS needs SLAVE MONITOR, granted by scripts/db.sh). */
  async check(): Promise<ReplicaState> {
    try {
      const [rows] = await this.replica.query("SHOW SLAVE STATUS");
      const r = (rows as SlaveStatus[])[0];
      const lag = r?.Seconds_Behind_Master == null ? null : Number(r.Seconds_Behind_Master);
      if (!r) this.set(false, null, "is not replicating from a primary (SHOW SLAVE STATUS is empty)");
      else if (r.Slave_IO_Running !== "Yes" || r.Slave_SQL_Running !== "Yes")
        this.set(
          false,
          lag,
          `has stopped replicating (IO ${r.Slave_IO_Running}, SQL ${r.Slave_SQL_Running})`,
        );
      else if (lag === null || lag > this.maxLagS)
        this.set(
          false,
          lag,
          `is ${lag ?? "?"} s behind the primary (DATABASE_REPLICA_MAX_LAG_S ${this.maxLagS})`,
        );
      else this.set(true, lag, "");
    } catch (e) {
      this.set(false, null, `does not answer (${message(e)})`);
    }
    return this.status();
  }

  private set(usable: boolean, lagS: number | null, reason: string): void {
    if (usable !== this.state.usable || this.state.checkedAt === 0)
      this.log(
        usable
          ? `[db] reads go to the replica (${lagS} s behind the primary)`
          : `[db] reads go to the primary: the replica ${reason}`,
      );
    Object.assign(this.state, { usable, lagS, reason, checkedAt: Date.now() });
  }

  private async route(): Promise<boolean> {
    const age = Date.now() - this.state.checkedAt;
    if (age >= this.intervalMs && !this.probing)
      this.probing = this.check().then(
        () => void (this.probing = null),
        () => void (this.probing = null),
      );
    // a state much older than the interval (after a quiet spell) is not trusted: wait for the check
    if (age >= 5 * this.intervalMs && this.probing) await this.probing;
    return this.state.usable;
  }

  private async run(method: "query" | "execute", args: unknown[]): Promise<unknown> {
    const call = (pool: mysql.Pool) => (pool[method] as (...a: unknown[]) => Promise<unknown>)(...args);
    if (await this.route()) {
      try {
        const answer = await call(this.replica);
        this.state.readsOnReplica++;
        return answer;
      } catch (e) {
        if (!isDbUnavailable(e)) throw e;
        this.set(false, null, `failed a read (${message(e)})`);
      }
    }
    this.state.readsOnPrimary++;
    return call(this.primary);
  }

  /** What Drizzle is handed in place of a pool. */
  client(): Pick<mysql.Pool, "query" | "execute" | "getConnection"> {
    return {
      query: ((...args: unknown[]) => this.run("query", args)) as mysql.Pool["query"],
      execute: ((...args: unknown[]) => this.run("execute", args)) as mysql.Pool["execute"],
      getConnection: () => this.primary.getConnection(),
    };
  }
}
