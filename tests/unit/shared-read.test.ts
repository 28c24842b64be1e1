/**
 * sharedRead (lib/core/shared-read.ts): calls that come while the same read runs share its
 * answer; nothing is kept after it settles; failures reach every joined caller and are not kept;
 * a read older than the join window is not joined.
 */
import { describe, expect, test } from "vitest";
import { sharedRead } from "@/lib/core/shared-read";

/** A read whose answers the test settles by hand, counting how often it ran. */
function handRead() {
  const calls: { key: string; settle(v: string): void; fail(e: Error): void }[] = [];
  const read = (key: string) =>
    new Promise<string>((settle, fail) => {
      calls.push({ key, settle, fail });
    });
  return { calls, read };
}

describe("sharedRead", () => {
  test("calls while a read runs share it; one read for five callers", async () => {
    const { calls, read } = handRead();
    const shared = sharedRead(read);
    const answers = Array.from({ length: 5 }, () => shared("board"));
    expect(calls).toHaveLength(1);
    expect(shared.running()).toBe(1);
    calls[0]!.settle("figures");
    expect(await Promise.all(answers)).toEqual(Array(5).fill("figures"));
    expect(shared.running()).toBe(0);
  });

  test("different keys are different reads", async () => {
    const { calls, read } = handRead();
    const shared = sharedRead(read);
    const a = shared("12");
    const b = shared("4");
    expect(calls.map((c) => c.key)).toEqual(["12", "4"]);
    calls[0]!.settle("twelve weeks");
    calls[1]!.settle("four weeks");
    expect([await a, await b]).toEqual(["twelve weeks", "four weeks"]);
  });

  test("nothing is kept: the call after a settled read reads afresh", async () => {
    const { calls, read } = handRead();
    const shared = sharedRead(read);
    const first = shared("board");
    calls[0]!.settle("before the decision");
    expect(await first).toBe("before the decision");
    const second = shared("board");
    expect(calls).toHaveLength(2);
    calls[1]!.settle("after the decision");
    expect(await second).toBe("after the decision");
  });

  test("a failure reaches every joined caller and the next call tries again", async () => {
    const { calls, read } = handRead();
    const shared = sharedRead(read);
    const joined = [shared("board"), shared("board")];
    calls[0]!.fail(new Error("The database is not reachable right now."));
    for (const p of joined) await expect(p).rejects.toThrow("not reachable");
    expect(shared.running()).toBe(0);
    const retry = shared("board");
    expect(calls).toHaveLength(2);
    calls[1]!.settle("figures");
    expect(await retry).toBe("figures");
  });

  test("a read that throws before its promise is a rejected answer, not a stuck flight", async () => {
    const shared = sharedRead<string, string>(() => {
      throw new Error("bad key");
    });
    await expect(shared("x")).rejects.toThrow("bad key");
    expect(shared.running()).toBe(0);
  });

  test("a read running longer than the join window is not joined; its own callers still get it", async () => {
    let clock = 0;
    const { calls, read } = handRead();
    const shared = sharedRead(read, { joinWithinMs: 1000, now: () => clock });
    const slow = shared("board");
    clock = 999;
    const joined = shared("board");
    expect(calls).toHaveLength(1);
    clock = 1001;
    const fresh = shared("board");
    expect(calls).toHaveLength(2);
    calls[0]!.settle("slow");
    expect([await slow, await joined]).toEqual(["slow", "slow"]);
    // the slow read settling does not remove the fresh read, which later calls still join
    expect(shared.running()).toBe(1);
    const late = shared("board");
    expect(calls).toHaveLength(2);
    calls[1]!.settle("fresh");
    expect([await fresh, await late]).toEqual(["fresh", "fresh"]);
    expect(shared.running()).toBe(0);
  });
});
