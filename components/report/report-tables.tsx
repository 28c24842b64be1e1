"use client";
/** The report's tables: findings and columns (the model's tables are model-tables.tsx). */
import { DataTable, type Column } from "@/components/data-table";
import { SeverityBadge, type Severity } from "@/components/severity-badge";
import { SummaryText } from "./box-plot";
import { FindingComment, useReview } from "@/components/triage/review-context";
import { formatCount, formatNumber } from "@/lib/format";
import type { ColumnReport, Finding } from "@/lib/readiness";

export { CoefficientsTable, CollinearityTable } from "./model-tables";

const SEVERITY_ORDER = { blocker: 0, warning: 1, note: 2 } as const;

export type FindingRow = Finding & { id: string; status?: "resolved" | "remains" | "new" };

function rowsText(f: Finding): string {
  if (f.rows.length === 0) return "";
  const more = (f.rowCount ?? f.rows.length) > f.rows.length ? ` … (${formatCount(f.rowCount)} in all)` : "";
  return f.rows.join(", ") + more;
}

export function FindingsTable({
  findings,
  caption = "Findings",
  csvName,
  commentable = false,
}: {
  findings: FindingRow[];
  caption?: string;
  csvName?: string;
  /** the version's own findings on a page where a decision is made: a comment box on each row */
  commentable?: boolean;
}) {
  // the pool's findings (drift, poolability) shown under a decision are not the version's: no comment
  const context = useReview();
  const review = commentable ? context : null;
  const columns: Column<FindingRow>[] = [
    {
      key: "severity",
      header: "Severity",
      width: "7.5rem",
      value: (f) => SEVERITY_ORDER[f.severity],
      render: (f) => <SeverityBadge severity={f.severity} />,
    },
    ...(findings.some((f) => f.status)
      ? [
          {
            key: "status",
            header: "Since last version",
            width: "8rem",
            value: (f: FindingRow) => f.status ?? "",
          } satisfies Column<FindingRow>,
        ]
      : []),
    {
      key: "code",
      header: "Code",
      width: "minmax(9rem, 1fr)",
      value: (f) => f.code,
      render: (f) => <code className="text-xs">{f.code}</code>,
    },
    {
      key: "columns",
      header: "Columns",
      width: "minmax(8rem, 1fr)",
      value: (f) => f.columns.join(", "),
      render: (f) => <span className="font-mono text-xs">{f.columns.join(", ")}</span>,
    },
    { key: "message", header: "What was found", width: "minmax(16rem, 3fr)", value: (f) => f.message },
    {
      key: "rows",
      header: "Rows",
      width: "minmax(8rem, 1.2fr)",
      value: (f) => rowsText(f),
      render: (f) => <span className="text-xs tabular-nums">{rowsText(f)}</span>,
    },
    { key: "fix", header: "What to do", width: "minmax(14rem, 2.5fr)", value: (f) => f.fix },
    ...(review
      ? [
          {
            key: "comment",
            header: "Your comment",
            width: "minmax(12rem, 2fr)",
            value: (f: FindingRow) => review.comments[f.id] ?? "",
            render: (f: FindingRow) => (
              <FindingComment id={f.id} code={f.code} label={`${f.code} ${f.columns.join(", ")}`} />
            ),
            sortable: false,
            csv: false,
          } satisfies Column<FindingRow>,
        ]
      : []),
  ];
  return (
    <DataTable
      rows={findings}
      columns={columns}
      caption={caption}
      collapsedRows={5}
      csvName={csvName}
      filterPlaceholder="Filter findings"
    />
  );
}

type ColumnRow = ColumnReport & { id: string; reading: Severity | null; readingCodes: string[] };

/** The most severe finding on each column, with its codes: the Columns table's "Reading". */
function readingsOf(findings: readonly Finding[]): Map<string, { severity: Severity; codes: string[] }> {
  const out = new Map<string, { severity: Severity; codes: string[] }>();
  for (const f of findings) {
    for (const c of f.columns) {
      const had = out.get(c);
      if (!had) out.set(c, { severity: f.severity, codes: [f.code] });
      else {
        if (SEVERITY_ORDER[f.severity] < SEVERITY_ORDER[had.severity]) had.severity = f.severity;
        if (!had.codes.includes(f.code)) had.codes.push(f.code);
      }
    }
  }
  return out;
}

/**
 * One row per column. "Looks like" is what the values look like, told plainly (a key or text
 * column looks like anything); the "Reading" is the column's most severe finding, with the
 * findings' own word and shape, so nothing is marked here that the findings do not say.
 */
export function ColumnsTable({
  columns: cols,
  findings = [],
  csvName,
}: {
  columns: ColumnReport[];
  findings?: readonly Finding[];
  csvName?: string;
}) {
  const readings = readingsOf(findings);
  const rows: ColumnRow[] = cols.map((c) => ({
    ...c,
    id: c.name,
    reading: readings.get(c.name)?.severity ?? null,
    readingCodes: readings.get(c.name)?.codes ?? [],
  }));
  const columns: Column<ColumnRow>[] = [
    {
      key: "name",
      header: "Column",
      width: "minmax(10rem, 1.5fr)",
      value: (c) => c.name,
      render: (c) => <span className="font-mono text-xs">{c.name}</span>,
    },
    { key: "role", header: "Role", width: "6.5rem", value: (c) => c.role ?? "not in plan" },
    { key: "planned", header: "Planned type", width: "7rem", value: (c) => c.plannedType ?? "–" },
    { key: "inferred", header: "Looks like", width: "7rem", value: (c) => c.inferredType },
    {
      key: "reading",
      header: "Reading",
      width: "minmax(9rem, 1.2fr)",
      value: (c) => (c.reading ? `${c.reading}: ${c.readingCodes.join(", ")}` : ""),
      render: (c) =>
        c.reading ? (
          <span className="flex flex-wrap items-center gap-1" title={c.readingCodes.join(", ")}>
            <SeverityBadge severity={c.reading} />
            <code className="text-xs">
              {c.readingCodes[0]}
              {c.readingCodes.length > 1 ? ` +${c.readingCodes.length - 1}` : ""}
            </code>
          </span>
        ) : (
          <span className="text-silt-ink">—</span>
        ),
    },
    {
      key: "missing",
      header: "Missing",
      numeric: true,
      width: "6.5rem",
      value: (c) => c.missing.fraction,
      render: (c) => formatNumber(c.missing.fraction, "percent"),
    },
    {
      key: "summary",
      header: "Range / levels",
      width: "minmax(16rem, 3fr)",
      value: (c) =>
        c.summary
          ? `min ${formatNumber(c.summary.min, "measure")}, median ${c.quartiles === "sample" ? "≈" : ""}${formatNumber(c.summary.median, "measure")}, max ${formatNumber(c.summary.max, "measure")}, mean ${formatNumber(c.summary.mean, "estimate")}, sd ${formatNumber(c.summary.sd, "estimate")}`
          : (c.levels ?? []).map((l) => `${l.level} ${l.count}`).join("; "),
      render: (c) =>
        c.levels && c.levels.length > 0 ? (
          <LevelBars levels={c.levels} />
        ) : c.summary ? (
          <SummaryText s={c.summary} sampled={c.quartiles === "sample"} />
        ) : (
          "–"
        ),
      sortable: false,
    },
  ];
  return (
    <DataTable
      rows={rows}
      columns={columns}
      caption="Columns"
      collapsedRows={5}
      csvName={csvName}
      filterPlaceholder="Filter columns"
    />
  );
}

/** Level bars: one bar per level, sparse levels (under 10 rows) marked. */
export function LevelBars({
  levels,
  sparse = 10,
}: {
  levels: { level: string; count: number }[];
  sparse?: number;
}) {
  const max = Math.max(1, ...levels.map((l) => l.count));
  const shown = levels.slice(0, 12);
  return (
    <ul className="grid w-full gap-0.5 text-xs" aria-label="Level counts">
      {shown.map((l) => (
        <li key={l.level} className="grid grid-cols-[minmax(5rem,8rem)_1fr_3.5rem] items-center gap-2">
          <span className="truncate font-mono" title={l.level}>
            {JSON.stringify(l.level).slice(1, -1) || "(blank)"}
          </span>
          <span className="h-2 bg-sand-deep">
            <span
              className={`block h-2 ${l.count < sparse ? "bg-ochre" : "bg-channel"}`}
              style={{ width: `${(l.count / max) * 100}%` }}
            />
          </span>
          <span className="text-right tabular-nums">
            {formatCount(l.count)}
            {l.count < sparse ? " ◇" : ""}
          </span>
        </li>
      ))}
      {levels.length > shown.length ? (
        <li className="text-silt-ink">… and {levels.length - shown.length} more levels</li>
      ) : null}
    </ul>
  );
}
