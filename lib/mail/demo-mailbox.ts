import "server-only";
/**
 * The demo mailbox: what the local SMTP fake received, read over its HTTP API. Only when
 * MAILBOX_URL is configured; each user sees the messages addressed to them (admins: all).
 */
import { env } from "@/lib/env";
import type { SessionUser } from "@/lib/auth/session";

export type MailSummary = { id: string; receivedAt: string; from: string; to: string[]; subject: string };
export type MailMessage = MailSummary & { text: string; html: string | null };

export function mailboxEnabled(): boolean {
  return Boolean(env().MAILBOX_URL);
}

function base(): string {
  const url = env().MAILBOX_URL;
  if (!url) throw new Error("MAILBOX_URL is not set");
  return url.replace(/\/$/, "");
}

const addressesOf = (v: unknown): string[] =>
  (Array.isArray(v) ? v : [v])
    .flatMap((x) => (typeof x === "string" ? x.split(",") : []))
    .map((s) => (/<([^>]+)>/.exec(s)?.[1] ?? s).trim().toLowerCase())
    .filter(Boolean);

export async function listMailFor(user: SessionUser): Promise<MailSummary[]> {
  const q = user.role === "admin" ? "" : `?to=${encodeURIComponent(user.email)}`;
  const res = await fetch(`${base()}/messages${q}`, { cache: "no-store", signal: AbortSignal.timeout(5000) });
  if (!res.ok) throw new Error(`the mailbox answered ${res.status}`);
  const body = (await res.json()) as {
    messages: { id: string; receivedAt: string; from: string; to: unknown; subject: string }[];
  };
  return body.messages
    .map((m) => ({
      id: m.id,
      receivedAt: m.receivedAt,
      from: m.from,
      to: addressesOf(m.to),
      subject: m.subject,
    }))
    .filter((m) => user.role === "admin" || m.to.includes(user.email.toLowerCase()))
    .reverse();
}

export async function getMailFor(user: SessionUser, id: string): Promise<MailMessage | null> {
  if (!/^[A-Za-z0-9_-]{1,80}$/.test(id)) return null;
  const res = await fetch(`${base()}/messages/${id}`, {
    cache: "no-store",
    signal: AbortSignal.timeout(5000),
  });
  if (res.status === 404) return null;
  if (!res.ok) throw new Error(`the mailbox answered ${res.status}`);
  const m = (await res.json()) as {
    id: string;
    receivedAt: string;
    from: string;
    to: unknown;
    subject: string;
    text?: string;
    html?: string | false;
  };
  const to = addressesOf(m.to);
  if (user.role !== "admin" && !to.includes(user.email.toLowerCase())) return null;
  return {
    id: m.id,
    receivedAt: m.receivedAt,
    from: m.from,
    to,
    subject: m.subject,
    text: m.text ?? "",
    html: typeof m.html === "string" ? m.html : null,
  };
}
