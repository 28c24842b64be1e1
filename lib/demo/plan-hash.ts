/** A stable fingerprint of a data plan: equal plans give equal hashes, whatever their key order. */
import { createHash } from "node:crypto";

/** JSON with object keys sorted at every level; undefined members are dropped, as JSON.stringify does. */
export function canonicalJson(value: unknown): string {
  return JSON.stringify(sortKeys(value));
}

function sortKeys(value: unknown): unknown {
  if (Array.isArray(value)) return value.map(sortKeys);
  if (value !== null && typeof value === "object") {
    const out: Record<string, unknown> = {};
    for (const key of Object.keys(value).sort()) {
      const v = (value as Record<string, unknown>)[key];
      if (v !== undefined) out[key] = sortKeys(v);
    }
    return out;
  }
  return value;
}

/** sha-256 (hex) of the plan's canonical JSON. */
export function planHash(plan: unknown): string {
  return createHash("sha256").update(canonicalJson(plan)).digest("hex");
}
