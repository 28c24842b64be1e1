/** Deep equality of two reports, numbers equal to 1e-9 relative (floating-point merge order). */
import { expect } from "vitest";

export function close(x: unknown, y: unknown, at: string): void {
  if (typeof x === "number" && typeof y === "number") {
    expect(Math.abs(x - y), `${at}: ${x} vs ${y}`).toBeLessThanOrEqual(1e-9 * Math.max(1, Math.abs(x)));
    return;
  }
  if (x && typeof x === "object" && y && typeof y === "object") {
    const keys = new Set([...Object.keys(x), ...Object.keys(y)]);
    for (const k of keys)
      close((x as Record<string, unknown>)[k], (y as Record<string, unknown>)[k], `${at}.${k}`);
    return;
  }
  expect(y, at).toEqual(x);
}
