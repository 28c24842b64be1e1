/** The SMTP transport (nodemailer) from SMTP_URL, one per process. */
import nodemailer, { type Transporter } from "nodemailer";
import { env } from "@/lib/env";

let cached: Transporter | undefined;

/** Builds a transport for an smtp:// URL with short timeouts, so an outage fails fast and is retried later. */
export function createTransport(smtpUrl: string): Transporter {
  const u = new URL(smtpUrl);
  if (u.protocol !== "smtp:" && u.protocol !== "smtps:")
    throw new Error(`SMTP_URL must start with smtp:// or smtps://, not ${u.protocol}//.`);
  return nodemailer.createTransport({
    host: u.hostname,
    port: Number(u.port || (u.protocol === "smtps:" ? 465 : 25)),
    secure: u.protocol === "smtps:",
    auth: u.username
      ? { user: decodeURIComponent(u.username), pass: decodeURIComponent(u.password) }
      : undefined,
    connectionTimeout: 5_000,
    greetingTimeout: 5_000,
    socketTimeout: 20_000,
  });
}

/** The process-wide transport for SMTP_URL. */
export function transport(): Transporter {
  cached ??= createTransport(env().SMTP_URL);
  return cached;
}
