/**
 * Starts both fakes for the demo and the tests: the upload service on FAKE_UPLOAD_PORT
 * (3401), SMTP on FAKE_SMTP_PORT (3402) and its mailbox API on FAKE_MAILBOX_PORT (3403).
 * Prints one line containing "fakes ready" once all three listen; stops on SIGINT/SIGTERM.
 * Data: FAKE_UPLOAD_DIR (default .data/uploads), FAKE_MAIL_DIR (default .data/mail).
 */
import path from "node:path";
import { parseUploadToken, startUploadFake } from "./upload-service";
import { startSmtpFake } from "./smtp";

const DEV_TOKEN = Buffer.from(
  JSON.stringify({
    apiKey: "sk_dev_tributary_local_0000000000",
    appId: "tributary-dev",
    regions: ["local1"],
  }),
).toString("base64");

function port(name: string, fallback: number): number {
  const raw = process.env[name];
  if (raw === undefined || raw === "") return fallback;
  const n = Number(raw);
  if (!Number.isInteger(n) || n < 0 || n > 65535)
    throw new Error(`${name} must be a port number, not "${raw}".`);
  return n;
}

async function main(): Promise<void> {
  const root = path.resolve(import.meta.dirname, "..");
  const token = parseUploadToken(process.env.UPLOADTHING_TOKEN || DEV_TOKEN);
  const upload = await startUploadFake({
    port: port("FAKE_UPLOAD_PORT", 3401),
    apiKey: token.apiKey,
    appId: token.appId,
    dir: path.resolve(root, process.env.FAKE_UPLOAD_DIR || ".data/uploads"),
    log: (m) => console.error(m),
  });
  const smtp = await startSmtpFake({
    smtpPort: port("FAKE_SMTP_PORT", 3402),
    httpPort: port("FAKE_MAILBOX_PORT", 3403),
    dir: path.resolve(root, process.env.FAKE_MAIL_DIR || ".data/mail"),
  });
  console.log(`fakes ready: upload ${upload.url}, smtp ${smtp.smtpUrl}, mailbox ${smtp.mailboxUrl}`);

  let stopping = false;
  const stop = () => {
    if (stopping) return;
    stopping = true;
    const force = setTimeout(() => process.exit(1), 5000);
    force.unref();
    Promise.all([upload.close(), smtp.close()]).then(
      () => process.exit(0),
      () => process.exit(1),
    );
  };
  process.on("SIGINT", stop);
  process.on("SIGTERM", stop);
}

main().catch((e: unknown) => {
  const err = e as NodeJS.ErrnoException;
  if (err.code === "EADDRINUSE")
    console.error(`fakes: a port is already in use (${err.message}). Is another instance running?`);
  else console.error(`fakes: ${err.stack ?? err}`);
  process.exit(1);
});
