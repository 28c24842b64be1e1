/**
 * In-memory coordination of the upload fake: route registrations posted by the app,
 * open dev streams, and PUTs held until the app reports its `onUploadComplete` result.
 */
import type { ServerResponse } from "node:http";

export type DevStream = {
  res: ServerResponse;
  /** keys whose callback has not been written yet */
  pending: Set<string>;
  closed: boolean;
  timer: NodeJS.Timeout;
};

export type Registration = {
  metadata: Record<string, unknown>;
  isDev: boolean;
  callbackUrl: string;
  callbackSlug: string;
  awaitServerData: boolean;
  stream: DevStream | null;
  createdAt: number;
};

export type HeldResult = { ok: true; serverData: unknown } | { ok: false; error: string };

export class IngestState {
  readonly registrations = new Map<string, Registration>();
  private readonly waiters = new Map<string, Set<() => void>>();
  private readonly held = new Map<string, (r: HeldResult) => void>();
  readonly uploading = new Set<string>();
  readonly streams = new Set<DevStream>();

  register(keys: string[], reg: Registration): void {
    // forget registrations whose upload never came (presigned URLs live an hour by default)
    const old = Date.now() - 6 * 3600_000;
    for (const [k, r] of this.registrations) if (r.createdAt < old) this.registrations.delete(k);
    for (const k of keys) {
      this.registrations.set(k, reg);
      const w = this.waiters.get(k);
      if (w) for (const f of w) f();
      this.waiters.delete(k);
    }
  }

  /** The registration for `key`, waiting up to `ms` for the app's /route-metadata to arrive. */
  async waitForRegistration(key: string, ms: number): Promise<Registration | null> {
    const now = this.registrations.get(key);
    if (now || ms <= 0) return now ?? null;
    await new Promise<void>((resolve) => {
      const set = this.waiters.get(key) ?? new Set();
      const done = () => {
        clearTimeout(t);
        set.delete(done);
        resolve();
      };
      const t = setTimeout(done, ms);
      set.add(done);
      this.waiters.set(key, set);
    });
    return this.registrations.get(key) ?? null;
  }

  /** Removes the key from its registration and from its dev stream; ends the stream when none is left. */
  finish(key: string): void {
    const reg = this.registrations.get(key);
    this.registrations.delete(key);
    const s = reg?.stream;
    if (s) {
      s.pending.delete(key);
      if (s.pending.size === 0) this.endStream(s);
    }
  }

  endStream(s: DevStream): void {
    clearTimeout(s.timer);
    if (!s.closed) {
      s.closed = true;
      s.res.end();
    }
    this.streams.delete(s);
  }

  /** Starts waiting for the app's callback result for `key`; resolve by `settle`. */
  hold(key: string, ms: number): Promise<HeldResult> {
    return new Promise<HeldResult>((resolve) => {
      const t = setTimeout(() => {
        this.held.delete(key);
        resolve({
          ok: false,
          error: `The app did not confirm recording the upload within ${Math.round(ms / 1000)} s. Try again.`,
        });
      }, ms);
      this.held.set(key, (r) => {
        clearTimeout(t);
        this.held.delete(key);
        resolve(r);
      });
    });
  }

  /** Delivers a result to a held PUT. Returns false when nothing was waiting. */
  settle(key: string, r: HeldResult): boolean {
    const f = this.held.get(key);
    if (!f) return false;
    f(r);
    return true;
  }

  shutdown(): void {
    for (const key of [...this.held.keys()])
      this.settle(key, { ok: false, error: "The upload service is shutting down." });
    for (const s of [...this.streams]) this.endStream(s);
  }
}
