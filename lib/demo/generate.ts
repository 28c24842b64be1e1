/** Shared by the demo's batch generators: the batch record, a seeded generator, rounding and CSV writing. */
import { mulberry32 } from "@/lib/readiness";

export interface DemoBatch {
  organisationSlug: string;
  studySlug: string;
  title: string;
  fileName: string;
  /** what this file is meant to show in the demo */
  shows: string;
  /** the analysts' decision the demo starts with, once the checks are done (none: left ready for review) */
  decision?: {
    by: string;
    decision: "accept" | "bounce";
    comment?: string;
    findingComments?: { code: string; columns: string[]; comment: string }[];
  };
  csv: string;
}

/** A small seeded generator (mulberry32), so the demo is the same every time. */
export function rng(seed: number) {
  const next = mulberry32(seed);
  const normal = () => {
    const u = Math.max(next(), 1e-12);
    return Math.sqrt(-2 * Math.log(u)) * Math.cos(2 * Math.PI * next());
  };
  const pick = <T>(xs: readonly T[]): T => xs[Math.floor(next() * xs.length)] as T;
  return { next, normal, pick };
}

export const round = (x: number, d: number) => Number(x.toFixed(d));

function quote(v: string | number, delimiter: string): string {
  const s = String(v);
  return s.includes(delimiter) || s.includes('"') || s.includes("\n") ? `"${s.replace(/"/g, '""')}"` : s;
}

export function toCsv<T extends Record<string, string | number>>(
  header: readonly (keyof T & string)[],
  rows: T[],
  delimiter = ",",
): string {
  const lines = [header.join(delimiter)];
  for (const row of rows) lines.push(header.map((h) => quote(row[h] ?? "", delimiter)).join(delimiter));
  return lines.join("\n") + "\n";
}
