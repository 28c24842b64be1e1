/**
 * A small streaming reader for multipart/form-data bodies (RFC 7578): the part named
 * `file` goes straight to disk while its md5 and size are computed, so large batches
 * never sit in memory. Other parts are ignored.
 */
import { createHash } from "node:crypto";
import { open } from "node:fs/promises";
import type { Readable } from "node:stream";

export class MultipartError extends Error {
  constructor(
    message: string,
    readonly status: number = 400,
  ) {
    super(message);
  }
}

export type ReceivedFile = { size: number; md5: string; filename: string | null; contentType: string | null };

/** The boundary parameter of a multipart/form-data content type, or null. */
export function boundaryOf(contentType: string | undefined): string | null {
  if (!contentType || !/^multipart\/form-data/i.test(contentType)) return null;
  const m = /boundary=(?:"([^"]+)"|([^;\s]+))/i.exec(contentType);
  return m ? (m[1] ?? m[2] ?? null) : null;
}

function parsePartHeaders(raw: string): {
  name: string | null;
  filename: string | null;
  contentType: string | null;
} {
  let name: string | null = null;
  let filename: string | null = null;
  let contentType: string | null = null;
  for (const line of raw.split("\r\n")) {
    const colon = line.indexOf(":");
    if (colon < 0) continue;
    const key = line.slice(0, colon).trim().toLowerCase();
    const value = line.slice(colon + 1).trim();
    if (key === "content-disposition") {
      name = /\bname="([^"]*)"/i.exec(value)?.[1] ?? null;
      filename = /\bfilename="([^"]*)"/i.exec(value)?.[1] ?? null;
    } else if (key === "content-type") {
      contentType = value;
    }
  }
  return { name, filename, contentType };
}

/**
 * Streams the `file` part of a multipart body into `destPath`.
 * Throws MultipartError (413 when more than `maxBytes` arrive, 400 on a malformed body
 * or a body without a `file` part).
 */
export async function receiveMultipartFile(
  body: Readable | AsyncIterable<Buffer>,
  boundary: string,
  destPath: string,
  maxBytes: number,
): Promise<ReceivedFile> {
  const first = Buffer.from(`--${boundary}`);
  const delim = Buffer.from(`\r\n--${boundary}`);
  const fh = await open(destPath, "w");
  const md5 = createHash("md5");
  let size = 0;
  let found: ReceivedFile | null = null;
  let state: "preamble" | "after-delim" | "headers" | "body" | "done" = "preamble";
  let toFile = false;
  let buf: Buffer = Buffer.alloc(0);

  const emit = async (chunk: Buffer) => {
    if (!toFile || chunk.length === 0) return;
    size += chunk.length;
    if (size > maxBytes)
      throw new MultipartError(`The file is larger than the ${maxBytes} bytes announced for it.`, 413);
    md5.update(chunk);
    await fh.write(chunk);
  };

  try {
    for await (const piece of body) {
      buf = buf.length ? Buffer.concat([buf, piece as Buffer]) : (piece as Buffer);
      let progressed = true;
      while (progressed && state !== "done") {
        progressed = false;
        if (state === "preamble") {
          const at = buf.indexOf(first);
          if (at >= 0) {
            buf = buf.subarray(at + first.length);
            state = "after-delim";
            progressed = true;
          } else if (buf.length > first.length) {
            buf = buf.subarray(buf.length - first.length);
          }
        } else if (state === "after-delim") {
          if (buf.length < 2) break;
          const two = buf.subarray(0, 2).toString("latin1");
          if (two === "--") {
            state = "done";
          } else if (two === "\r\n") {
            buf = buf.subarray(2);
            state = "headers";
            progressed = true;
          } else {
            throw new MultipartError("The multipart body is malformed (bad delimiter).");
          }
        } else if (state === "headers") {
          const end = buf.indexOf("\r\n\r\n");
          if (end < 0) {
            if (buf.length > 16 * 1024) throw new MultipartError("The multipart part headers are too long.");
            break;
          }
          const h = parsePartHeaders(buf.subarray(0, end).toString("utf8"));
          buf = buf.subarray(end + 4);
          toFile = h.name === "file" && found === null;
          if (toFile) found = { size: 0, md5: "", filename: h.filename, contentType: h.contentType };
          state = "body";
          progressed = true;
        } else if (state === "body") {
          const at = buf.indexOf(delim);
          if (at >= 0) {
            await emit(buf.subarray(0, at));
            buf = buf.subarray(at + delim.length);
            toFile = false;
            state = "after-delim";
            progressed = true;
          } else if (buf.length > delim.length) {
            const keep = delim.length - 1;
            await emit(buf.subarray(0, buf.length - keep));
            buf = Buffer.from(buf.subarray(buf.length - keep));
          }
        }
      }
    }
  } finally {
    await fh.close();
  }
  if (state !== "done") throw new MultipartError("The multipart body ended before its closing delimiter.");
  if (!found) throw new MultipartError("The multipart body has no part named `file`.");
  const done: ReceivedFile = found;
  return { ...done, size, md5: md5.digest("hex") };
}
