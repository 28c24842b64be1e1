/**
 * The cursor of the paged lists (lib/http/page.ts): base64url (RFC 4648 §5) of the list's name and
 * the last row's sort key, read back only by the list that gave it out; anything else is a 400
 * that says what to send. The next address keeps the request's query and moves the cursor on.
 */
import { describe, expect, test } from "vitest";
import { keysetList, pageOf } from "@/lib/http/keyset";
import { decodeCursor, encodeCursor, nextHref, pageParams } from "@/lib/http/page";
import { z } from "zod";

const BATCHES = keysetList<[Date, number]>("batches", ["date", "int"]);
const USERS = keysetList<[number, string, number]>("users", ["int", "text", "int"]);

describe("the cursor", () => {
  test("round-trips a key, moments to the millisecond", () => {
    const key: [Date, number] = [new Date("2026-12-02T20:40:01.123Z"), 42];
    const cursor = encodeCursor(BATCHES, key);
    // RFC 4648 §5: the URL- and filename-safe alphabet, no padding
    expect(cursor).toMatch(/^[A-Za-z0-9_-]+$/);
    expect(decodeCursor(BATCHES, cursor)).toEqual(key);
    expect(decodeCursor(USERS, encodeCursor(USERS, [2, "Ana Ó'Brien", 7]))).toEqual([2, "Ana Ó'Brien", 7]);
    expect(decodeCursor(BATCHES, undefined)).toBeUndefined();
  });

  test.each([
    ["text that is not base64url", "not a cursor!"],
    ["base64url of text that is not JSON", Buffer.from("hello").toString("base64url")],
    ["another list's cursor", encodeCursor(USERS, [1, "a", 1])],
    ["a key of the wrong kinds", Buffer.from(JSON.stringify(["batches", "x", "y"])).toString("base64url")],
    ["a key too short", Buffer.from(JSON.stringify(["batches", 3])).toString("base64url")],
    [
      "a moment that is no date",
      Buffer.from(JSON.stringify(["batches", "2026-13-45T99:00:00.000Z", 1])).toString("base64url"),
    ],
    [
      "a fractional id",
      Buffer.from(JSON.stringify(["batches", "2026-12-02T20:40:01.123Z", 1.5])).toString("base64url"),
    ],
  ])("refuses %s with a 400 that says what to send", (_what, cursor) => {
    expect(() => decodeCursor(BATCHES, cursor)).toThrow(
      /Follow the `next` address of the previous page unchanged/,
    );
    try {
      decodeCursor(BATCHES, cursor);
    } catch (e) {
      expect((e as { code: string }).code).toBe("bad_request");
    }
  });
});

describe("a page", () => {
  test("of limit+1 rows read keeps limit and keys the last kept one; fewer is the last page", () => {
    const rows = [{ id: 5 }, { id: 4 }, { id: 3 }];
    expect(pageOf(rows, 2, (r) => [r.id])).toEqual({ rows: [{ id: 5 }, { id: 4 }], nextKey: [4] });
    expect(pageOf(rows, 3, (r) => [r.id])).toEqual({ rows, nextKey: null });
  });

  test("next keeps the filters and limit and replaces the cursor; null on the last page", () => {
    const query = new URLSearchParams({ state: "ready", limit: "2", cursor: "old" });
    const key: [Date, number] = [new Date("2026-01-01T00:00:00.000Z"), 9];
    const href = nextHref("/api/v1/batches", query, BATCHES, { rows: [], nextKey: key })!;
    const url = new URL(href, "http://x");
    expect(url.pathname).toBe("/api/v1/batches");
    expect(url.searchParams.get("state")).toBe("ready");
    expect(url.searchParams.get("limit")).toBe("2");
    expect(decodeCursor(BATCHES, url.searchParams.get("cursor")!)).toEqual(key);
    expect(nextHref("/api/v1/batches", query, BATCHES, { rows: [], nextKey: null })).toBeNull();
  });

  test("limit: 100 unless asked, 1 to 500, with a message naming the range", () => {
    const schema = z.object(pageParams);
    expect(schema.parse({}).limit).toBe(100);
    expect(schema.parse({ limit: "500" }).limit).toBe(500);
    for (const bad of ["0", "501", "2.5", "ten"]) {
      const r = schema.safeParse({ limit: bad });
      expect(r.success).toBe(false);
      expect(r.error?.issues[0]?.message).toBe(
        "limit is a whole number from 1 to 500; follow `next` for the rows after.",
      );
    }
  });
});
