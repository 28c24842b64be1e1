/** Prints the demo sign-ins as a table (used by scripts/start.sh). */
import { DEMO_ORGANISATIONS, DEMO_PASSWORD, DEMO_USERS } from "@/lib/demo";

const rows = DEMO_USERS.map((u) => [
  u.email,
  u.role,
  DEMO_ORGANISATIONS.find((o) => o.slug === u.organisationSlug)?.name ?? "",
  u.note,
]);
const head = ["e-mail", "role", "organisation", "what for"];
const widths = head.map((h, i) => Math.max(h.length, ...rows.map((r) => r[i]?.length ?? 0)));
const line = (cells: string[]) => ("  " + cells.map((c, i) => c.padEnd(widths[i] ?? 0)).join("  ")).trimEnd();
console.log(line(head));
console.log(line(widths.map((w) => "-".repeat(w))));
for (const r of rows) console.log(line(r));
console.log(`\n  password for every account: ${DEMO_PASSWORD}`);
