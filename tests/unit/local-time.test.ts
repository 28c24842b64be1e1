/**
 * Timestamps in the viewer's zone and the ISO hover text. Offsets from the IANA tz database:
 * Pacific/Auckland is UTC+13 in December (NZDT), America/New_York UTC−5 (EST), Asia/Kolkata
 * UTC+5:30 (IST), Europe/London UTC+0 (GMT) in December. Time-zone names as ICU prints them for en-GB.
 */
import { describe, expect, test } from "vitest";
import { formatDateTime, formatLocalDateTime, isoSeconds } from "@/lib/format";

const AT = "2026-12-01T22:43:00.000Z";

describe("formatLocalDateTime", () => {
  test.each([
    ["UTC", "1 Dec 2026, 22:43 UTC"],
    ["Pacific/Auckland", "2 Dec 2026, 11:43 GMT+13"],
    ["America/New_York", "1 Dec 2026, 17:43 GMT-5"],
    ["Asia/Kolkata", "2 Dec 2026, 04:13 GMT+5:30"],
    ["Europe/London", "1 Dec 2026, 22:43 GMT"],
  ])("in %s", (zone, expected) => {
    expect(formatLocalDateTime(AT, { timeZone: zone })).toBe(expected);
  });

  test("the date alone moves to the next day east of UTC", () => {
    expect(formatLocalDateTime(AT, { timeZone: "Pacific/Auckland", dateOnly: true })).toBe("2 Dec 2026");
    expect(formatLocalDateTime(AT, { timeZone: "UTC", dateOnly: true })).toBe("1 Dec 2026");
  });

  test("in UTC it prints what the server prints, so a UTC viewer sees no change after hydration", () => {
    expect(formatLocalDateTime(AT, { timeZone: "UTC" })).toBe(formatDateTime(AT));
  });

  test("no time gives a dash", () => {
    expect(formatLocalDateTime(null)).toBe("–");
    expect(formatLocalDateTime("not a date")).toBe("–");
  });
});

describe("isoSeconds", () => {
  test("ISO 8601 in UTC to the second (RFC 3339 §5.6)", () => {
    expect(isoSeconds(AT)).toBe("2026-12-01T22:43:00Z");
    expect(isoSeconds(new Date(Date.UTC(2026, 0, 2, 3, 4, 5, 678)))).toBe("2026-01-02T03:04:05Z");
    expect(isoSeconds(undefined)).toBe("");
  });
});
