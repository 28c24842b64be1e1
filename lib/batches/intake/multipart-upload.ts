import "server-only";
/**
 * Reading an API upload (multipart/form-data) without holding the file in memory: the file
 * part streams through a SHA-256 hash into a temporary file, so a 200 MB batch costs the
 * server a few 64 KB chunks, not the file several times over. The caller hands the file on
 * as a disk-backed Blob and must call `discard()` when done.
 */
import { createHash, randomBytes } from "node:crypto";
import { createWriteStream, openAsBlob } from "node:fs";
import { mkdtemp, rm } from "node:fs/promises";
import os from "node:os";
import path from "node:path";
import { Readable, Transform } from "node:stream";
import { pipeline } from "node:stream/promises";
import busboy from "busboy";
import { AppError } from "@/lib/errors";

export interface ReceivedFile {
  /** the name the client gave (not yet cleaned) */
  name: string;
  type: string;
  size: number;
  /** hex SHA-256 of the bytes */
  hash: string;
  /** the bytes, read lazily from the temporary file */
  blob: () => Promise<Blob>;
}

export interface ReceivedUpload {
  fields: Record<string, string>;
  file: ReceivedFile | null;
  /** removes the temporary file; safe to call more than once */
  discard: () => Promise<void>;
}

const MALFORMED = "The multipart body could not be read. Send the fields 'study' and 'file'.";
const BAD_HEADER =
  "The file's name could not be read: it may hold control characters (such as NUL or escape codes). Rename the file using letters, digits and ordinary punctuation, then send it again.";

/** Undoes the escapes the WHATWG multipart/form-data encoding puts in names (LF, CR and `"`). */
function unescapeFormName(name: string): string {
  return name.replace(/%0A/gi, "\n").replace(/%0D/gi, "\r").replace(/%22/g, '"');
}

/**
 * Reads the multipart body of `req`: text fields (at most 16, each up to 4 KB) and one file
 * part named `file` (other file parts are refused). A file over `maxBytes` is refused with
 * `tooLarge` as the message; nothing is kept in that case.
 */
export async function receiveMultipart(
  req: Request,
  maxBytes: number,
  tooLarge: string,
): Promise<ReceivedUpload> {
  const type = req.headers.get("content-type") ?? "";
  if (!req.body) throw new AppError("bad_request", MALFORMED);
  const dir = await mkdtemp(path.join(os.tmpdir(), "tributary-upload-"));
  const discard = () => rm(dir, { recursive: true, force: true });
  let parser: busboy.Busboy;
  try {
    parser = busboy({
      headers: { "content-type": type },
      defParamCharset: "utf8",
      preservePath: true,
      // busboy flags a file once it *reaches* fileSize: one byte more keeps a file of exactly
      // maxBytes acceptable, as the size rule before upload and the upload service both allow
      limits: { files: 1, fileSize: maxBytes + 1, fields: 16, fieldSize: 4096, parts: 20 },
    });
  } catch {
    await discard();
    throw new AppError("bad_request", MALFORMED);
  }

  const fields: Record<string, string> = {};
  let file: ReceivedFile | null = null;
  let problem: AppError | null = null;
  const writes: Promise<void>[] = [];

  parser.on("field", (name, value, info) => {
    if (info.valueTruncated) problem ??= new AppError("invalid", `The field '${name}' is too long.`);
    else fields[name] = value;
  });
  parser.on("file", (name, stream, info) => {
    if (name !== "file" || file) {
      problem ??= new AppError("invalid", "Send one file, in the field 'file'.");
      stream.resume();
      return;
    }
    const target = path.join(dir, randomBytes(8).toString("hex"));
    const hash = createHash("sha256");
    let size = 0;
    const received: ReceivedFile = {
      name: unescapeFormName(info.filename ?? ""),
      type: info.mimeType || "text/csv",
      size: 0,
      hash: "",
      blob: () => openAsBlob(target, { type: info.mimeType || "text/csv" }),
    };
    file = received;
    stream.on("limit", () => {
      problem ??= new AppError("too_large", tooLarge, { fieldErrors: { file: [tooLarge] } });
    });
    const count = new Transform({
      transform(chunk: Buffer, _enc, done) {
        size += chunk.length;
        hash.update(chunk);
        done(null, chunk);
      },
    });
    writes.push(
      pipeline(stream, count, createWriteStream(target)).then(() => {
        received.size = size;
        received.hash = hash.digest("hex");
      }),
    );
  });
  parser.on("filesLimit", () => {
    problem ??= new AppError("invalid", "Send one file, in the field 'file'.");
  });

  try {
    await pipeline(
      Readable.fromWeb(req.body as import("node:stream/web").ReadableStream<Uint8Array>),
      parser,
    );
    await Promise.all(writes);
  } catch (error) {
    await discard();
    if (error instanceof AppError) throw error;
    const header = error instanceof Error && /header/i.test(error.message);
    throw header
      ? new AppError("invalid", BAD_HEADER, { cause: error })
      : new AppError("bad_request", MALFORMED, { cause: error });
  }
  if (problem) {
    await discard();
    throw problem;
  }
  return { fields, file, discard };
}
