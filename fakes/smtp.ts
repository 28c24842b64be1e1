/**
 * A local SMTP server that keeps every message (built on `smtp-server` and `mailparser`),
 * with a small HTTP JSON mailbox for tests and the demo mailbox page:
 *   GET /messages[?to=addr]   summaries, oldest first
 *   GET /messages/:id         one message, parsed (text, html, headers, subject, from, to)
 *   GET /messages/:id/raw     the message as received (RFC 5322)
 *   DELETE /messages          clears the mailbox
 * No authentication and no TLS: it listens on loopback only. Messages are written under
 * `dir` and reloaded on start.
 */
import { randomBytes } from "node:crypto";
import { mkdir, readdir, readFile, rm, writeFile } from "node:fs/promises";
import { createServer, type Server } from "node:http";
import type { AddressInfo } from "node:net";
import path from "node:path";
import { simpleParser, type AddressObject } from "mailparser";
import { SMTPServer } from "smtp-server";

export type StoredMessage = {
  id: string;
  receivedAt: string;
  /** SMTP envelope */
  envelope: { from: string | null; to: string[] };
  /** the From header as mailparser renders it, e.g. `"Tributary" <no-reply@tributary.test>` */
  from: string;
  fromAddress: string | null;
  to: string[];
  cc: string[];
  subject: string;
  messageId: string | null;
  text: string;
  html: string | null;
  headers: Record<string, string>;
  size: number;
};

export type MessageSummary = Pick<
  StoredMessage,
  "id" | "receivedAt" | "from" | "to" | "subject" | "messageId"
>;

export type SmtpFakeOptions = {
  smtpPort: number;
  httpPort: number;
  dir: string;
  host?: string;
  maxMessageBytes?: number;
};

export type SmtpFake = {
  smtpPort: number;
  httpPort: number;
  mailboxUrl: string;
  smtpUrl: string;
  close(): Promise<void>;
};

function addresses(a: AddressObject | AddressObject[] | undefined): string[] {
  const list = Array.isArray(a) ? a : a ? [a] : [];
  return list.flatMap((o) => o.value.map((v) => (v.address ?? "").toLowerCase())).filter(Boolean);
}

function summary(m: StoredMessage): MessageSummary {
  return {
    id: m.id,
    receivedAt: m.receivedAt,
    from: m.from,
    to: m.to,
    subject: m.subject,
    messageId: m.messageId,
  };
}

class Mailbox {
  readonly messages: StoredMessage[] = [];
  constructor(readonly dir: string) {}

  async load(): Promise<void> {
    await mkdir(this.dir, { recursive: true });
    const names = (await readdir(this.dir)).filter((n) => n.endsWith(".json")).sort();
    for (const n of names) {
      try {
        this.messages.push(JSON.parse(await readFile(path.join(this.dir, n), "utf8")) as StoredMessage);
      } catch {
        // a half-written file from a crash: skip it
      }
    }
    this.messages.sort((a, b) => a.id.localeCompare(b.id));
  }

  async add(raw: Buffer, envelope: StoredMessage["envelope"]): Promise<StoredMessage> {
    const parsed = await simpleParser(raw);
    const headers: Record<string, string> = {};
    for (const { key, line } of parsed.headerLines) {
      const value = line.slice(line.indexOf(":") + 1).trim();
      headers[key] = headers[key] === undefined ? value : `${headers[key]}\n${value}`;
    }
    // ids sort by arrival: time, then a counter-like random tail
    const id = `${Date.now().toString(36).padStart(9, "0")}-${randomBytes(4).toString("hex")}`;
    const msg: StoredMessage = {
      id,
      receivedAt: new Date().toISOString(),
      envelope,
      from: parsed.from?.text ?? envelope.from ?? "",
      fromAddress: addresses(parsed.from)[0] ?? null,
      to: addresses(parsed.to),
      cc: addresses(parsed.cc),
      subject: parsed.subject ?? "",
      messageId: parsed.messageId ?? null,
      text: parsed.text ?? "",
      html: typeof parsed.html === "string" ? parsed.html : null,
      headers,
      size: raw.length,
    };
    await writeFile(path.join(this.dir, `${id}.eml`), raw);
    await writeFile(path.join(this.dir, `${id}.json`), JSON.stringify(msg));
    this.messages.push(msg);
    return msg;
  }

  async clear(): Promise<number> {
    const n = this.messages.length;
    this.messages.length = 0;
    for (const f of await readdir(this.dir)) {
      if (f.endsWith(".json") || f.endsWith(".eml")) await rm(path.join(this.dir, f), { force: true });
    }
    return n;
  }
}

function json(res: import("node:http").ServerResponse, status: number, body: unknown): void {
  const text = JSON.stringify(body);
  res.writeHead(status, {
    "content-type": "application/json; charset=utf-8",
    "content-length": Buffer.byteLength(text),
  });
  res.end(text);
}

function mailboxServer(box: Mailbox): Server {
  return createServer((req, res) => {
    void (async () => {
      const url = new URL(req.url ?? "/", "http://mailbox");
      const parts = url.pathname.split("/").filter(Boolean);
      if (req.method === "GET" && url.pathname === "/health") return json(res, 200, { ok: true });
      if (parts[0] !== "messages") return json(res, 404, { error: `Nothing at ${url.pathname}.` });
      if (req.method === "DELETE" && parts.length === 1)
        return json(res, 200, { deleted: await box.clear() });
      if (req.method !== "GET") return json(res, 405, { error: "Use GET, or DELETE /messages." });
      if (parts.length === 1) {
        const to = url.searchParams.get("to")?.toLowerCase();
        const list = to
          ? box.messages.filter((m) => m.to.includes(to) || m.cc.includes(to) || m.envelope.to.includes(to))
          : box.messages;
        return json(res, 200, { messages: list.map(summary) });
      }
      const msg = box.messages.find((m) => m.id === parts[1]);
      if (!msg) return json(res, 404, { error: "No such message." });
      if (parts.length === 2) return json(res, 200, msg);
      if (parts.length === 3 && parts[2] === "raw") {
        const raw = await readFile(path.join(box.dir, `${msg.id}.eml`));
        res.writeHead(200, { "content-type": "message/rfc822", "content-length": raw.length });
        return void res.end(raw);
      }
      json(res, 404, { error: `Nothing at ${url.pathname}.` });
    })().catch((e: unknown) => {
      if (!res.headersSent) json(res, 500, { error: (e as Error).message });
      else res.destroy();
    });
  });
}

function listen(
  server: {
    listen: (port: number, host: string, cb: () => void) => unknown;
    once: (ev: "error", cb: (e: Error) => void) => unknown;
  },
  port: number,
  host: string,
) {
  return new Promise<void>((resolve, reject) => {
    server.once("error", reject);
    server.listen(port, host, () => resolve());
  });
}

/** Starts the SMTP fake and its mailbox API; resolves once both listen. */
export async function startSmtpFake(opts: SmtpFakeOptions): Promise<SmtpFake> {
  const host = opts.host ?? "127.0.0.1";
  const box = new Mailbox(opts.dir);
  await box.load();
  const maxBytes = opts.maxMessageBytes ?? 25 * 1024 * 1024;
  const smtp = new SMTPServer({
    authOptional: true,
    disabledCommands: ["STARTTLS", "AUTH"],
    hideSTARTTLS: true,
    size: maxBytes,
    logger: false,
    banner: "Tributary SMTP fake",
    closeTimeout: 2000,
    onData(stream, session, callback) {
      const chunks: Buffer[] = [];
      stream.on("data", (c: Buffer) => chunks.push(c));
      stream.on("end", () => {
        if ((stream as unknown as { sizeExceeded?: boolean }).sizeExceeded) {
          return callback(
            Object.assign(new Error(`Message exceeds ${maxBytes} bytes`), { responseCode: 552 }),
          );
        }
        const envelope = {
          from: session.envelope.mailFrom ? session.envelope.mailFrom.address.toLowerCase() : null,
          to: session.envelope.rcptTo.map((r) => r.address.toLowerCase()),
        };
        box.add(Buffer.concat(chunks), envelope).then(
          (m) => callback(null, `Queued as ${m.id}`),
          (e: Error) =>
            callback(
              Object.assign(new Error(`Could not store the message: ${e.message}`), { responseCode: 451 }),
            ),
        );
      });
    },
  });
  const http = mailboxServer(box);
  await listen(smtp.server, opts.smtpPort, host);
  await listen(http, opts.httpPort, host);
  const smtpPort = (smtp.server.address() as AddressInfo).port;
  const httpPort = (http.address() as AddressInfo).port;
  return {
    smtpPort,
    httpPort,
    smtpUrl: `smtp://${host}:${smtpPort}`,
    mailboxUrl: `http://${host}:${httpPort}`,
    close: async () => {
      await Promise.all([
        new Promise<void>((resolve) => smtp.close(() => resolve())),
        new Promise<void>((resolve) => {
          http.close(() => resolve());
          http.closeAllConnections();
        }),
      ]);
    },
  };
}
