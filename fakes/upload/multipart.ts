/**
 * Reads the multipart/form-data body (RFC 7578) of an upload with busboy, as the app does
 * (lib/batches/intake/multipart-upload.ts): the part named `file` goes straight to disk while
 * its md5 and size are computed, so large batches never sit in memory. Other parts are ignored.
 *
 * Three things keep the uploadthing SDK's PUT from hanging:
 * - every part's stream is read to its end, the ignored ones included: busboy only finishes
 *   once each file stream it handed out has ended, so one left unread stalls the whole body;
 * - the answer waits for busboy's `close` *and* for the file on disk to be complete, so the
 *   body has been read to its closing delimiter before the fake answers;
 * - on a bad body the request is unpiped and drained, never destroyed (as `pipeline()` would
 *   do), so the socket stays open for the 400 or 413 that says what went wrong.
 */
import { createHash } from "node:crypto";
import { createWriteStream } from "node:fs";
import { type Readable, Transform } from "node:stream";
import { pipeline } from "node:stream/promises";
import busboy from "busboy";

export class MultipartError extends Error {
  constructor(
    message: string,
    readonly status: number = 400,
  ) {
    super(message);
  }
}

export type ReceivedFile = { size: number; md5: string; filename: string | null; contentType: string | null };

const NO_FILE = "The multipart body has no part named `file`.";
const FILE_AS_FIELD =
  'The part named `file` has no filename, so it was read as a text field: send it as a file (Content-Disposition: form-data; name="file"; filename="…").';
export const NOT_MULTIPART = "The upload must be multipart/form-data with a boundary and a `file` part.";

function parserFor(contentType: string | undefined, maxBytes: number): busboy.Busboy {
  try {
    return busboy({
      headers: { "content-type": contentType ?? "" },
      defParamCharset: "utf8",
      // busboy flags a file as over the limit once it *reaches* fileSize; one byte more keeps
      // a file of exactly the announced size acceptable
      limits: { fileSize: maxBytes + 1, fieldSize: 64 * 1024, headerPairs: 100 },
    });
  } catch {
    throw new MultipartError(NOT_MULTIPART);
  }
}

/** Whether `contentType` is multipart/form-data with a boundary busboy can read. */
export function isMultipartWithBoundary(contentType: string | undefined): boolean {
  try {
    const probe = parserFor(contentType, 1);
    // destroying a parser that saw no body makes it report an unfinished form: expected here
    probe.on("error", () => {});
    probe.destroy();
    return true;
  } catch {
    return false;
  }
}

/** Busboy's words for a broken body, in words that say what to fix. */
function explain(error: Error): MultipartError {
  if (/unexpected end/i.test(error.message))
    return new MultipartError("The multipart body ended before its closing delimiter.");
  return new MultipartError(`The multipart body is malformed (${error.message}).`);
}

/**
 * Streams the first `file` part of a multipart body into `destPath` (created only when that part
 * arrives). Throws MultipartError: 413 when more than `maxBytes` arrive, 400 on a content type
 * without a boundary, a malformed body or a body without a `file` part; a plain Error when the
 * client goes away.
 */
export function receiveMultipartFile(
  req: Readable,
  contentType: string | undefined,
  destPath: string,
  maxBytes: number,
): Promise<ReceivedFile> {
  const parser = parserFor(contentType, maxBytes);
  return new Promise<ReceivedFile>((resolve, reject) => {
    let found: ReceivedFile | null = null;
    let written: Promise<void> | null = null;
    let tooLarge = false;
    let fileWithoutName = false;
    let settled = false;

    const fail = (error: Error) => {
      if (settled) return;
      settled = true;
      req.unpipe(parser);
      parser.destroy();
      // keep reading (and dropping) the rest, so the socket can carry the answer
      req.resume();
      reject(error);
    };

    parser.on("file", (name, stream, info) => {
      if (name !== "file" || found) {
        stream.resume();
        return;
      }
      const got: ReceivedFile = {
        size: 0,
        md5: "",
        filename: info.filename ?? null,
        contentType: info.mimeType || null,
      };
      found = got;
      const md5 = createHash("md5");
      const count = new Transform({
        transform(chunk: Buffer, _enc, done) {
          got.size += chunk.length;
          md5.update(chunk);
          done(null, chunk);
        },
      });
      stream.on("limit", () => {
        tooLarge = true;
      });
      written = pipeline(stream, count, createWriteStream(destPath)).then(() => {
        got.md5 = md5.digest("hex");
      });
      // a disk error ends the file stream early, which would stall busboy: give up at once (a
      // turn later, so busboy's own word on a broken body, which also ends the stream, comes first)
      written.catch((e: unknown) => setImmediate(() => fail(e as Error)));
    });
    parser.on("field", (name) => {
      if (name === "file") fileWithoutName = true;
    });
    parser.on("error", (e: unknown) => fail(explain(e as Error)));
    parser.on("close", () => {
      void (async () => {
        if (settled) return;
        try {
          await written;
        } catch {
          return; // already failed
        }
        if (settled) return;
        settled = true;
        if (tooLarge)
          reject(new MultipartError(`The file is larger than the ${maxBytes} bytes announced for it.`, 413));
        else if (!found) reject(new MultipartError(fileWithoutName ? FILE_AS_FIELD : NO_FILE));
        else resolve(found);
      })();
    });
    req.on("error", (e) => fail(e));
    req.on("aborted", () => fail(new Error("the client closed the connection before the body ended")));
    req.pipe(parser);
  });
}
