/**
 * The upload fake's multipart reader (busboy) behind a real loopback HTTP server, so each case
 * also shows that the answer reaches the client: a stalled parser would hang the request, a
 * destroyed request would reset the socket instead of carrying the 400. Bodies are written by
 * hand in the RFC 7578 form (delimiter `--boundary`, CRLF line ends, closing `--boundary--`);
 * expected md5 values come from node:crypto (RFC 1321) over the bytes sent.
 */
import { createHash, randomBytes } from "node:crypto";
import { createServer, request, type Server } from "node:http";
import { mkdtemp, readFile, rm } from "node:fs/promises";
import type { AddressInfo } from "node:net";
import os from "node:os";
import path from "node:path";
import { afterAll, beforeAll, describe, expect, test } from "vitest";
import {
  isMultipartWithBoundary,
  MultipartError,
  NOT_MULTIPART,
  receiveMultipartFile,
} from "@/fakes/upload/multipart";

const B = "----tributaryTestBoundary7MA4YWxk";
const TYPE = `multipart/form-data; boundary=${B}`;
const MAX = 8 * 1024 * 1024;

let dir: string;
let server: Server;
let base: string;
let n = 0;

beforeAll(async () => {
  dir = await mkdtemp(path.join(os.tmpdir(), "tributary-fake-multipart-"));
  server = createServer((req, res) => {
    const dest = path.join(dir, `part-${++n}`);
    const max = Number(req.headers["x-max"] ?? MAX);
    const answer = (status: number, body: unknown) => {
      res.writeHead(status, { "content-type": "application/json" });
      res.end(JSON.stringify(body));
    };
    if (!isMultipartWithBoundary(req.headers["content-type"])) {
      req.resume();
      return answer(400, { error: NOT_MULTIPART });
    }
    receiveMultipartFile(req, req.headers["content-type"], dest, max).then(
      async (got) => answer(200, { ...got, stored: (await readFile(dest)).toString("base64") }),
      (e: Error) => answer(e instanceof MultipartError ? e.status : 500, { error: e.message }),
    );
  });
  await new Promise<void>((r) => server.listen(0, "127.0.0.1", r));
  base = `http://127.0.0.1:${(server.address() as AddressInfo).port}`;
});

afterAll(async () => {
  await new Promise((r) => server.close(r));
  await rm(dir, { recursive: true, force: true });
});

type Answer = { status: number; body: Record<string, unknown> };

/** PUTs the pieces one write at a time (no Content-Length: chunked), as a slow client would. */
function put(pieces: Buffer[], contentType = TYPE, headers: Record<string, string> = {}): Promise<Answer> {
  return new Promise((resolve, reject) => {
    const req = request(
      `${base}/key`,
      { method: "PUT", headers: { "content-type": contentType, ...headers } },
      (res) => {
        const parts: Buffer[] = [];
        res.on("data", (c: Buffer) => parts.push(c));
        res.on("end", () =>
          resolve({ status: res.statusCode!, body: JSON.parse(Buffer.concat(parts).toString("utf8")) }),
        );
      },
    );
    req.on("error", reject);
    for (const p of pieces) req.write(p);
    req.end();
  });
}

const filePart = (name: string, filename: string, bytes: Buffer, type = "text/csv") =>
  Buffer.concat([
    Buffer.from(
      `--${B}\r\nContent-Disposition: form-data; name="${name}"; filename="${filename}"\r\n` +
        `Content-Type: ${type}\r\n\r\n`,
    ),
    bytes,
    Buffer.from("\r\n"),
  ]);
const fieldPart = (name: string, value: string) =>
  Buffer.from(`--${B}\r\nContent-Disposition: form-data; name="${name}"\r\n\r\n${value}\r\n`);
const CLOSE = Buffer.from(`--${B}--\r\n`);
const md5 = (b: Buffer) => createHash("md5").update(b).digest("hex");

/** Splits a buffer into pieces of `size` bytes, so delimiters fall across writes. */
const chunks = (b: Buffer, size: number) =>
  Array.from({ length: Math.ceil(b.length / size) }, (_, i) => b.subarray(i * size, (i + 1) * size));

describe("the upload fake's multipart reader", () => {
  test("stores the `file` part byte for byte with its md5, across writes that split the delimiter", async () => {
    const bytes = randomBytes(300_000);
    // delimiter look-alikes inside the file must stay file bytes
    for (let i = 0; i < bytes.length - 64; i += 40_003)
      bytes.write(`\r\n--${B.slice(0, -1)}x\r\n`, i, "latin1");
    const body = Buffer.concat([
      fieldPart("note", "spring plots"),
      filePart("file", "plots.csv", bytes),
      CLOSE,
    ]);
    const r = await put(chunks(body, 777));
    expect(r.status).toBe(200);
    expect(r.body).toMatchObject({
      size: bytes.length,
      md5: md5(bytes),
      filename: "plots.csv",
      contentType: "text/csv",
    });
    expect(Buffer.from(r.body.stored as string, "base64").equals(bytes)).toBe(true);
  });

  test("an ignored file part bigger than a stream buffer is read through, so the `file` after it arrives", async () => {
    // 1 MiB is far above a stream's 64 KiB high-water mark: left unread, it would stall the parser
    const other = randomBytes(1024 * 1024);
    const bytes = Buffer.from("plot,yield\n1,4.2\n");
    const body = Buffer.concat([
      filePart("attachment", "photo.png", other, "image/png"),
      filePart("file", "a.csv", bytes),
      CLOSE,
    ]);
    const r = await put(chunks(body, 16 * 1024));
    expect(r.status).toBe(200);
    expect(r.body).toMatchObject({ size: bytes.length, md5: md5(bytes), filename: "a.csv" });
  });

  test("only the first `file` part is kept", async () => {
    const first = Buffer.from("a\n1\n");
    const body = Buffer.concat([
      filePart("file", "1.csv", first),
      filePart("file", "2.csv", Buffer.from("b\n2\n")),
      CLOSE,
    ]);
    const r = await put([body]);
    expect(r.body).toMatchObject({ md5: md5(first), filename: "1.csv" });
  });

  test("a body without a `file` part answers 400 saying so", async () => {
    const r = await put([Buffer.concat([fieldPart("study", "barley"), CLOSE])]);
    expect(r).toEqual({ status: 400, body: { error: "The multipart body has no part named `file`." } });
  });

  test("a `file` part without a filename answers 400 saying to send it as a file", async () => {
    const r = await put([Buffer.concat([fieldPart("file", "a,b\n1,2\n"), CLOSE])]);
    expect(r.status).toBe(400);
    expect(r.body.error).toMatch(/has no filename.*send it as a file/);
  });

  test("a body cut off before its closing delimiter answers 400", async () => {
    const cut = filePart("file", "cut.csv", Buffer.from("a,b\n1,2\n")).subarray(0, -4);
    const r = await put([cut]);
    expect(r).toEqual({
      status: 400,
      body: { error: "The multipart body ended before its closing delimiter." },
    });
  });

  test("a part header that is not a header answers 400 malformed", async () => {
    const bad = Buffer.from(`--${B}\r\nContent-Disposition form-data name="file"\r\n\r\nx\r\n--${B}--\r\n`);
    const r = await put([bad]);
    expect(r.status).toBe(400);
    expect(r.body.error).toMatch(/^The multipart body is malformed \(|no part named/);
  });

  test("more bytes than allowed answer 413 naming the limit, after the rest was read", async () => {
    const r = await put(
      [Buffer.concat([filePart("file", "big.csv", Buffer.alloc(50_000, 49)), CLOSE])],
      TYPE,
      {
        "x-max": "10",
      },
    );
    expect(r).toEqual({
      status: 413,
      body: { error: "The file is larger than the 10 bytes announced for it." },
    });
  });

  test("exactly the allowed number of bytes is accepted (the limit is inclusive)", async () => {
    const bytes = Buffer.from("0123456789");
    const r = await put([Buffer.concat([filePart("file", "ten.csv", bytes), CLOSE])], TYPE, {
      "x-max": "10",
    });
    expect(r.status).toBe(200);
    expect(r.body.size).toBe(10);
  });

  test("a content type without a boundary, or not multipart, is refused before any reading", async () => {
    expect(isMultipartWithBoundary(TYPE)).toBe(true);
    expect(isMultipartWithBoundary(`multipart/form-data; boundary="${B}"`)).toBe(true);
    expect(isMultipartWithBoundary("multipart/form-data")).toBe(false);
    expect(isMultipartWithBoundary("text/csv")).toBe(false);
    expect(isMultipartWithBoundary(undefined)).toBe(false);
    const r = await put([Buffer.from("a,b\n")], "multipart/form-data");
    expect(r).toEqual({ status: 400, body: { error: NOT_MULTIPART } });
  });
});
