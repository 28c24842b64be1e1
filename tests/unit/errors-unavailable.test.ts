/**
 * A database outage reaches API clients as 503 "try again", not as a 500: mysql2's own
 * error codes (ECONNREFUSED, PROTOCOL_CONNECTION_LOST; MariaDB errno 2013 "Lost connection")
 * are recognised through Drizzle's wrapper, and a wrong query stays an internal error.
 */
import { describe, expect, test, vi } from "vitest";
import { ERROR_STATUS, toAppError } from "@/lib/errors";

function driverError(code: string, errno?: number): Error {
  return Object.assign(new Error(`connect ${code}`), { code, ...(errno ? { errno } : {}) });
}

describe("toAppError and database outages", () => {
  vi.spyOn(console, "error").mockImplementation(() => undefined);

  test.each([
    ["refused connection", driverError("ECONNREFUSED")],
    ["connection lost mid-query", driverError("PROTOCOL_CONNECTION_LOST")],
    [
      "lost connection during query (MariaDB errno 2013)",
      Object.assign(new Error("Lost connection"), { errno: 2013 }),
    ],
    ["wrapped by the ORM", new Error("Failed query: select 1", { cause: driverError("ECONNREFUSED") })],
  ])("%s → unavailable, 503, a message saying to try again", (_label, error) => {
    const app = toAppError(error, "test");
    expect(app.code).toBe("unavailable");
    expect(ERROR_STATUS[app.code]).toBe(503);
    expect(app.message).toMatch(/database is not reachable.*try again/i);
  });

  test("a wrong query (ER_PARSE_ERROR, errno 1064) stays an internal error", () => {
    const app = toAppError(
      Object.assign(new Error("You have an error in your SQL syntax"), {
        code: "ER_PARSE_ERROR",
        errno: 1064,
      }),
      "test",
    );
    expect(app.code).toBe("internal");
    expect(ERROR_STATUS[app.code]).toBe(500);
  });
});
