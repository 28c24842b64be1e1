/**
 * The scale run judges its p95 targets over the busy window (first upload → last report or
 * decision), not over the quiet wait for a last e-mail: fast answers in that tail must not pull
 * a slow busy p95 under the target, and slow answers before the window must not count either.
 */
import { afterEach, describe, expect, test, vi } from "vitest";
import type { AfterChecks } from "@/scripts/load/scale-checks";
import { printScale } from "@/scripts/load/scale-report";
import { ScaleRecorder } from "@/scripts/load/scale-traffic";

const after: AfterChecks = {
  batches: 10,
  versions: 10,
  versionsWithoutOneReport: 0,
  orgsWithMoreThanOneBatch: 0,
  decisions: 10,
  decisionsWithoutAudit: 0,
  outboxRows: 10,
  outboxSent: 10,
  mailboxMessages: 10,
  mailsSentTwice: 0,
  checkJobsTakenOver: 0,
  mailsRetried: 0,
  lastDecisionAt: new Date(1_000_000 + 50_000),
  lastMailSentAt: new Date(1_000_000 + 400_000),
};

function run(rec: ScaleRecorder) {
  return printScale({
    settings: { batches: 10, rows: 100, wave: 10, analysts: 2, leads: 1, rate: 1 },
    rec,
    outcomes: Array.from({ length: 10 }, (_, k) => ({
      k,
      status: 201,
      batchId: `b${k}`,
      instance: "app-a",
      acceptedAt: 1_000_000,
    })),
    faults: [],
    after,
    lag: [],
    signIn: { instances: { "app-a": 5, "app-b": 5 }, refusedAfter: true, detail: "" },
    reportsOpened: 10,
    decided: 10,
    windowS: 400,
    uploadsS: 10,
    checksS: 40,
    lastReportAt: new Date(1_000_000 + 40_000),
    machine: "test",
    startedAt: 1_000_000,
  });
}

/** `n` answers of `ms` each, answered from `from` on, one a millisecond apart */
function answers(rec: ScaleRecorder, endpoint: "queue" | "board", from: number, n: number, ms: number) {
  vi.setSystemTime(from);
  for (let i = 0; i < n; i++) {
    vi.setSystemTime(from + i);
    rec.record(endpoint, "app-a", 200, ms, "{}");
  }
}

describe("the scale run's busy window", () => {
  afterEach(() => {
    vi.useRealTimers();
    vi.restoreAllMocks();
  });

  test("fast answers after the last decision do not flatter a slow busy p95", () => {
    vi.useFakeTimers();
    vi.spyOn(console, "log").mockImplementation(() => undefined);
    const rec = new ScaleRecorder();
    // in the window (ends at +50 s, the last decision): 100 answers of 400 ms
    answers(rec, "queue", 1_000_000 + 1_000, 100, 400);
    // the quiet tail up to the last e-mail: 2,000 answers of 5 ms
    answers(rec, "queue", 1_000_000 + 60_000, 2_000, 5);
    const figures = run(rec);
    const queue = figures.targets.find((t) => t.name.startsWith("queue p95"))!;
    expect(queue.met).toBe(false);
    expect(queue.detail).toContain("p95 400 ms over 100 requests");
    // the whole run's p95 alone would have passed: the tail is 95 % of it
    expect(queue.detail).toContain("whole run: 5 ms over 2100");
    expect(figures.busy.seconds).toBe(50);
  });

  test("answers before the first upload are left out, those inside count", () => {
    vi.useFakeTimers();
    vi.spyOn(console, "log").mockImplementation(() => undefined);
    const rec = new ScaleRecorder();
    answers(rec, "board", 1_000_000 - 5_000, 50, 900);
    answers(rec, "board", 1_000_000 + 2_000, 40, 120);
    const board = run(rec).targets.find((t) => t.name.startsWith("board p95"))!;
    expect(board.met).toBe(true);
    expect(board.detail).toContain("p95 120 ms over 40 requests");
  });
});
