/**
 * The environment, checked once with zod. Read lazily (at first use), so that
 * `next build` needs none of it; `instrumentation.ts` and the worker call it at start, so a
 * production server with the demo secrets refuses to boot instead of failing later.
 */
import { z } from "zod";

/**
 * Secrets that are public because they are written in this repository (.env.example, the
 * test and e2e scripts). Fine on loopback for the demo and the tests; refused in production
 * unless TRIBUTARY_DEMO=1 says this is the demo.
 */
export const PUBLIC_SECRETS = {
  NEXTAUTH_SECRET: [
    "tributary-demo-secret-change-me-0000000000",
    "e2e-only-secret-not-for-production-000000",
    "test-secret-not-for-production-0123456789",
  ],
  /** the api key inside the dev UPLOADTHING_TOKEN (whatever base64 spelling carries it) */
  UPLOADTHING_API_KEY: ["sk_dev_tributary_local_0000000000"],
  /** user:password of the demo database account */
  DATABASE_CREDENTIALS: ["tributary:tributary"],
} as const;

/** The api key inside an UPLOADTHING_TOKEN (base64 JSON), or null when it does not decode. */
export function uploadTokenApiKey(token: string): string | null {
  try {
    const v = JSON.parse(Buffer.from(token, "base64").toString("utf8")) as { apiKey?: unknown };
    return typeof v.apiKey === "string" ? v.apiKey : null;
  } catch {
    return null;
  }
}

function databaseCredentials(url: string): string | null {
  try {
    const u = new URL(url);
    return `${decodeURIComponent(u.username)}:${decodeURIComponent(u.password)}`;
  } catch {
    return null;
  }
}

function isLoopback(url: string): boolean {
  const host = new URL(url).hostname;
  return host === "127.0.0.1" || host === "localhost" || host === "[::1]";
}

const base = z.object({
  NODE_ENV: z.enum(["development", "production", "test"]).default("development"),
  DATABASE_URL: z.string().url().startsWith("mysql://", "DATABASE_URL must be a mysql:// URL"),
  /** a read replica of DATABASE_URL for the board, pool and report reads (db/client.ts getReadDb) */
  DATABASE_REPLICA_URL: z
    .string()
    .url()
    .startsWith("mysql://", "DATABASE_REPLICA_URL must be a mysql:// URL")
    .optional()
    .or(z.literal("").transform(() => undefined)),
  /** how far (seconds) the replica may lag before its reads go to the primary */
  DATABASE_REPLICA_MAX_LAG_S: z.coerce
    .number()
    .int()
    .min(0, "DATABASE_REPLICA_MAX_LAG_S must be 0 or more seconds")
    .default(5),
  APP_URL: z.string().url().default("http://127.0.0.1:3400"),
  NEXTAUTH_URL: z.string().url().optional(),
  NEXTAUTH_SECRET: z.string().min(16, "NEXTAUTH_SECRET must be at least 16 characters"),
  UPLOADTHING_TOKEN: z.string().min(10).optional(),
  UPLOADTHING_INGEST_URL: z.string().url().optional(),
  UPLOADTHING_API_URL: z.string().url().optional(),
  UPLOADTHING_CALLBACK_URL: z.string().url().optional(),
  SMTP_URL: z.string().default("smtp://127.0.0.1:3402"),
  MAIL_FROM: z.string().default("Tributary <no-reply@tributary.test>"),
  /** the SMTP fake's HTTP side; when set, the demo mailbox page is shown */
  MAILBOX_URL: z.string().url().optional(),
  MAX_UPLOAD_MB: z.coerce.number().int().positive().default(200),
  /** API calls one personal token may make per minute (lib/auth/rate-limit.ts) */
  API_RATE_LIMIT_PER_MINUTE: z.coerce.number().int().positive().default(600),
  /** the host of the upload service's file URLs, when it is not the SDK's default (the fake: 127.0.0.1:3401) */
  UPLOADTHING_UFS_HOST: z.string().optional(),
  /** "1" when running the demo: allows the demo secrets under NODE_ENV=production */
  TRIBUTARY_DEMO: z.string().optional(),
});

const GENERATE = "generate one with `openssl rand -base64 32`";

const schema = base.superRefine((e, ctx) => {
  if (e.NODE_ENV !== "production" || e.TRIBUTARY_DEMO === "1") return;
  const refuse = (path: string, message: string) => ctx.addIssue({ code: "custom", path: [path], message });
  if ((PUBLIC_SECRETS.NEXTAUTH_SECRET as readonly string[]).includes(e.NEXTAUTH_SECRET)) {
    refuse(
      "NEXTAUTH_SECRET",
      `is a demo value published in this repository; set NEXTAUTH_SECRET to a secret of your own (${GENERATE})`,
    );
  } else if (e.NEXTAUTH_SECRET.length < 32) {
    refuse("NEXTAUTH_SECRET", `must be at least 32 characters in production (${GENERATE})`);
  }
  if (!e.UPLOADTHING_TOKEN) {
    refuse("UPLOADTHING_TOKEN", "is required in production; set it to the token of your upload-service app");
  } else {
    const key = uploadTokenApiKey(e.UPLOADTHING_TOKEN);
    if (key !== null && (PUBLIC_SECRETS.UPLOADTHING_API_KEY as readonly string[]).includes(key)) {
      refuse(
        "UPLOADTHING_TOKEN",
        "carries the demo api key published in this repository; set UPLOADTHING_TOKEN to the token of your upload-service app",
      );
    }
  }
  for (const key of ["DATABASE_URL", "DATABASE_REPLICA_URL"] as const) {
    const creds = e[key] ? databaseCredentials(e[key]) : null;
    if (creds !== null && (PUBLIC_SECRETS.DATABASE_CREDENTIALS as readonly string[]).includes(creds)) {
      refuse(
        key,
        `uses the demo database user and password published in this repository; create a database user with a password of your own and put it in ${key}`,
      );
    }
  }
  // session cookies are Secure only over https; plain http is for loopback
  const appHttps = e.APP_URL.startsWith("https://");
  if (!appHttps && !isLoopback(e.APP_URL)) {
    refuse(
      "APP_URL",
      "must be the app's https:// address in production, so session cookies are sent over TLS only",
    );
  }
  // next-auth names its cookies (__Secure-…) from NEXTAUTH_URL, also where a token is read back
  if (appHttps !== (e.NEXTAUTH_URL ?? "").startsWith("https://")) {
    refuse("NEXTAUTH_URL", "must be set to the same https:// address as APP_URL");
  }
});

export type Env = z.infer<typeof schema>;

/** The check without caching, for start-up checks and tests: the parsed settings or a message saying what to set. */
export function checkEnv(
  source: Record<string, string | undefined> = process.env,
): { ok: true; env: Env } | { ok: false; message: string } {
  const r = schema.safeParse(source);
  if (r.success) return { ok: true, env: r.data };
  const lines = r.error.issues.map((i) => `  ${i.path.join(".")}: ${i.message}`).join("\n");
  const demo =
    source.NODE_ENV === "production" && source.TRIBUTARY_DEMO !== "1"
      ? "\nNODE_ENV=production without TRIBUTARY_DEMO=1 refuses the demo secrets of .env.example. For the local demo only, set TRIBUTARY_DEMO=1."
      : "";
  return {
    ok: false,
    message: `The environment is not set up correctly:\n${lines}${demo}\nSee .env.example.`,
  };
}

let cached: Env | undefined;

/** The checked environment (cached); throws with a message saying what to set. */
export function env(): Env {
  if (cached) return cached;
  const r = checkEnv(process.env);
  if (!r.ok) throw new Error(r.message);
  cached = r.env;
  return cached;
}

/**
 * For start-up hooks: checks the environment and, when it is not right, prints what to set
 * and ends the process with status 1 (Node only; the edge runtime has no process.exit).
 */
export function exitUnlessEnvOk(who: string): void {
  const r = checkEnv(process.env);
  if (r.ok) return;
  console.error(`[${who}] refusing to start.\n${r.message}`);
  process.exit(1);
}

/**
 * A timing setting of the worker and the check queue (TRIBUTARY_JOB_STALE_MS, TRIBUTARY_WORKER_POLL_MS …):
 * a positive whole number of milliseconds from the environment, else the default.
 */
export function msFromEnv(name: string, fallback: number): number {
  const raw = process.env[name];
  if (raw === undefined || raw.trim() === "") return fallback;
  const n = Number(raw);
  if (!Number.isInteger(n) || n <= 0)
    throw new Error(`${name} must be a positive whole number of milliseconds; it is "${raw}".`);
  return n;
}

/**
 * One setting as the process has it, unchecked: for code that is loaded before the check can
 * run (next-auth's options, the upload router, the proxy) — at `next build` none is set.
 * Code that runs per request uses env().
 */
export function rawSetting(name: keyof Env): string | undefined {
  return process.env[name];
}

/**
 * The worker's CPU priority as a Unix nice value (TRIBUTARY_WORKER_NICE, 0 to 19; default 10):
 * checks are batch work, so on a machine shared with an app instance the app's answers get the
 * processor first. 0 runs the worker at the app's priority.
 */
export function workerNiceFromEnv(): number {
  const raw = process.env.TRIBUTARY_WORKER_NICE;
  if (raw === undefined || raw.trim() === "") return 10;
  const n = Number(raw);
  if (!Number.isInteger(n) || n < 0 || n > 19)
    throw new Error(`TRIBUTARY_WORKER_NICE must be a whole number from 0 to 19; it is "${raw}".`);
  return n;
}

/**
 * How many threads the worker checks a large batch with (TRIBUTARY_CHECK_WORKERS, 1 to 16);
 * unset means the engine's default, one per core.
 */
export function checkWorkersFromEnv(): number | undefined {
  const raw = process.env.TRIBUTARY_CHECK_WORKERS;
  if (raw === undefined || raw.trim() === "") return undefined;
  const n = Number(raw);
  if (!Number.isInteger(n) || n < 1 || n > 16)
    throw new Error(`TRIBUTARY_CHECK_WORKERS must be a whole number from 1 to 16; it is "${raw}".`);
  return n;
}
