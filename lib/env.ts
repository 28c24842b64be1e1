/**
 * The environment, checked once with zod. Read lazily (at first use), so that
 * `next build` needs none of it.
 */
import { z } from "zod";

const schema = z.object({
  NODE_ENV: z.enum(["development", "production", "test"]).default("development"),
  DATABASE_URL: z.string().url().startsWith("mysql://", "DATABASE_URL must be a mysql:// URL"),
  APP_URL: z.string().url().default("http://127.0.0.1:3400"),
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
  /** "1" when running the demo: allows the demo secrets under NODE_ENV=production */
  TRIBUTARY_DEMO: z.string().optional(),
});

export type Env = z.infer<typeof schema>;

let cached: Env | undefined;

export function env(): Env {
  if (cached) return cached;
  const r = schema.safeParse(process.env);
  if (!r.success) {
    const lines = r.error.issues.map((i) => `  ${i.path.join(".")}: ${i.message}`).join("\n");
    throw new Error(`The environment is not set up correctly:\n${lines}\nSee .env.example.`);
  }
  cached = r.data;
  return cached;
}
