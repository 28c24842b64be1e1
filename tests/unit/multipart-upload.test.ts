/**
 * The API's streaming multipart reader: the file part lands in a temporary file with its
 * size and SHA-256 (checked against node:crypto over the same bytes), names come back as
 * sent (the WHATWG form encoding's %22 undone), and a body over the limit is refused with
 * the given message even when no Content-Length announced it, leaving no temporary file.
 */
import { createHash } from "node:crypto";
import { readdir } from "node:fs/promises";
import os from "node:os";
import { describe, expect, test } from "vitest";
import { AppError } from "@/lib/errors";
import { receiveMultipart } from "@/lib/batches/intake/multipart-upload";

const tempUploads = async () =>
  (await readdir(os.tmpdir())).filter((n) => n.startsWith("tributary-upload-")).length;

/** A multipart request; `stream` sends the body as a stream, so no Content-Length is set. */
async function formRequest(form: FormData, stream = false): Promise<Request> {
  const encoded = new Request("http://127.0.0.1/api/v1/batches", { method: "POST", body: form });
  const type = encoded.headers.get("content-type")!;
  if (!stream)
    return new Request(encoded.url, {
      method: "POST",
      headers: { "content-type": type },
      body: await encoded.arrayBuffer(),
    });
  return new Request(encoded.url, {
    method: "POST",
    headers: { "content-type": type },
    body: encoded.body,
    duplex: "half",
  } as RequestInit);
}

describe("receiveMultipart", () => {
  test("streams the file to disk with its size and SHA-256; fields kept; name as sent", async () => {
    const bytes = new TextEncoder().encode("plot,yield\n" + "1,2.5\n".repeat(50_000));
    const form = new FormData();
    form.append("study", "barley-nitrogen");
    form.append("file", new File([bytes], 'say "hi"; x=1.csv', { type: "text/csv" }));
    const before = await tempUploads();
    const got = await receiveMultipart(await formRequest(form, true), 10 * 1024 * 1024, "too large");
    expect(got.fields).toEqual({ study: "barley-nitrogen" });
    expect(got.file?.name).toBe('say "hi"; x=1.csv');
    expect(got.file?.size).toBe(bytes.length);
    expect(got.file?.hash).toBe(createHash("sha256").update(bytes).digest("hex"));
    const blob = await got.file!.blob();
    expect(new Uint8Array(await blob.arrayBuffer())).toEqual(bytes);
    await got.discard();
    expect(await tempUploads()).toBe(before);
  });

  test("a streamed body over the limit is refused with the caller's message and nothing is kept", async () => {
    const form = new FormData();
    form.append("study", "barley-nitrogen");
    form.append("file", new File([new Uint8Array(300_000).fill(49)], "big.csv"));
    const before = await tempUploads();
    const err = await receiveMultipart(
      await formRequest(form, true),
      100_000,
      "The upload is larger than the limit.",
    ).catch((e: unknown) => e);
    expect(err).toBeInstanceOf(AppError);
    expect((err as AppError).message).toBe("The upload is larger than the limit.");
    expect(await tempUploads()).toBe(before);
  });

  test("a file of exactly the limit is accepted, one byte more is refused (the limit is inclusive)", async () => {
    const sized = (n: number) => {
      const form = new FormData();
      form.append("file", new File([new Uint8Array(n).fill(49)], "edge.csv"));
      return formRequest(form, true);
    };
    const got = await receiveMultipart(await sized(100_000), 100_000, "too large");
    expect(got.file?.size).toBe(100_000);
    await got.discard();
    const err = await receiveMultipart(await sized(100_001), 100_000, "too large").catch((e: unknown) => e);
    expect((err as AppError).message).toBe("too large");
  });

  test("two file parts are refused; a body without a file gives file null", async () => {
    const two = new FormData();
    two.append("file", new File(["a\n1\n"], "a.csv"));
    two.append("file", new File(["a\n1\n"], "b.csv"));
    const err = await receiveMultipart(await formRequest(two), 1e6, "too large").catch((e: unknown) => e);
    expect((err as AppError).message).toMatch(/Send one file, in the field 'file'/);

    const none = new FormData();
    none.append("study", "barley-nitrogen");
    const got = await receiveMultipart(await formRequest(none), 1e6, "too large");
    expect(got.file).toBeNull();
    await got.discard();
  });

  test("a body that is not multipart is refused saying what to send", async () => {
    const req = new Request("http://127.0.0.1/", {
      method: "POST",
      headers: { "content-type": "multipart/form-data; boundary=x" },
      body: "garbage",
    });
    const err = await receiveMultipart(req, 1e6, "too large").catch((e: unknown) => e);
    expect((err as AppError).message).toMatch(
      /multipart body could not be read|Send the fields 'study' and 'file'/,
    );
  });
});
