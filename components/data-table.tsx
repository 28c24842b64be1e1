"use client";

import { useId, useMemo, useState, type ReactNode } from "react";
import {
  Table,
  Header,
  HeaderRow,
  Body,
  Row,
  Cell,
  HeaderCell,
} from "@table-library/react-table-library/table";
import { useSort, HeaderCellSort } from "@table-library/react-table-library/sort";
import { useTheme } from "@table-library/react-table-library/theme";
import type { TableNode } from "@table-library/react-table-library/types/table";
import { toCsv } from "@/lib/format";
import { Button } from "@/components/ui/button";
import { sized } from "@/components/ui/input";

type CellValue = string | number | boolean | Date | null | undefined;

export type Column<T> = {
  key: string;
  header: string;
  /** the raw value: used to sort, filter and write the CSV */
  value: (row: T) => CellValue;
  /** how the cell is drawn (defaults to the value as text) */
  render?: (row: T) => ReactNode;
  /** numbers line up on the right with tabular figures */
  numeric?: boolean;
  /** CSS grid track, e.g. "minmax(8rem, 2fr)" or "7rem" */
  width?: string;
  sortable?: boolean;
  /** false leaves the column out of the CSV (buttons, controls) */
  csv?: boolean;
};

type Props<T extends TableNode> = {
  rows: T[];
  columns: Column<T>[];
  /** accessible name of the table, also the start of the CSV file name */
  caption: string;
  csvName?: string;
  filterPlaceholder?: string;
  empty?: ReactNode;
  toolbar?: ReactNode;
  /** shows only the first rows until "Show all N" is pressed (the CSV still holds every row) */
  collapsedRows?: number;
};

function comparable(v: CellValue): string | number {
  if (v === null || v === undefined) return "";
  if (v instanceof Date) return v.getTime();
  if (typeof v === "boolean") return v ? 1 : 0;
  return v;
}

function compare(a: CellValue, b: CellValue): number {
  const x = comparable(a);
  const y = comparable(b);
  // empty values sort last in ascending order
  if (x === "" && y !== "") return 1;
  if (y === "" && x !== "") return -1;
  if (typeof x === "number" && typeof y === "number") return x - y;
  return String(x).localeCompare(String(y), "en", { numeric: true, sensitivity: "base" });
}

function asText(v: CellValue): string {
  if (v === null || v === undefined) return "";
  if (v instanceof Date) return v.toISOString();
  return String(v);
}

const SortIcon = ({ dir }: { dir: "none" | "up" | "down" }) => (
  <svg width="9" height="12" viewBox="0 0 9 12" aria-hidden="true" className="shrink-0">
    <path d="M4.5 1 L8 5 H1 Z" fill={dir === "up" ? "var(--t-channel)" : "var(--t-silt-faint)"} />
    <path d="M4.5 11 L8 7 H1 Z" fill={dir === "down" ? "var(--t-channel)" : "var(--t-silt-faint)"} />
  </svg>
);

/**
 * Every table of the product: sorts on each column, filters on text, downloads what is
 * shown (filtered and sorted) as CSV with formula-safe cells.
 */
export function DataTable<T extends TableNode>({
  rows,
  columns,
  caption,
  csvName,
  filterPlaceholder = "Filter rows",
  empty,
  toolbar,
  collapsedRows,
}: Props<T>) {
  const [query, setQuery] = useState("");
  const [expanded, setExpanded] = useState(false);
  const filterId = useId();

  const filtered = useMemo(() => {
    const q = query.trim().toLowerCase();
    if (!q) return rows;
    return rows.filter((r) => columns.some((c) => asText(c.value(r)).toLowerCase().includes(q)));
  }, [rows, columns, query]);

  const limit = !expanded && collapsedRows && filtered.length > collapsedRows + 1 ? collapsedRows : null;
  const data = useMemo(() => ({ nodes: filtered }), [filtered]);

  const sortFns = useMemo(() => {
    const fns: Record<string, (nodes: TableNode[]) => TableNode[]> = {};
    for (const c of columns) {
      if (c.sortable === false) continue;
      fns[c.key] = (nodes) => [...nodes].sort((a, b) => compare(c.value(a as T), c.value(b as T)));
    }
    return fns;
  }, [columns]);

  const sort = useSort(
    data,
    {},
    {
      sortFns,
      sortIcon: {
        margin: "0 0 0 4px",
        iconDefault: <SortIcon dir="none" />,
        iconUp: <SortIcon dir="up" />,
        iconDown: <SortIcon dir="down" />,
      },
    },
  );

  const template = columns
    .map((c) => c.width ?? (c.numeric ? "minmax(6rem, 1fr)" : "minmax(9rem, 2fr)"))
    .join(" ");
  const theme = useTheme({
    Table: `--data-table-library_grid-template-columns: ${template}; font-size: 0.8125rem; line-height: 1.25rem;`,
    HeaderRow: `background: var(--t-sand-deep); color: var(--t-ink);`,
    HeaderCell: `font-weight: 600; padding: 7px 10px; border-bottom: 1px solid var(--t-silt); text-align: left;
      & button { font-weight: 600; color: var(--t-ink); }
      & > div { white-space: normal; }
      & button > div { white-space: normal; overflow: visible; text-overflow: clip; text-align: inherit; }
      &.th-num > div { display: flex; justify-content: flex-end; text-align: right; }`,
    Row: `background: var(--t-surface); color: var(--t-ink);
      &:nth-of-type(even) { background: var(--t-stripe); }
      &:hover { background: var(--t-channel-wash); }`,
    Cell: `padding: 6px 10px; border-bottom: 1px solid var(--t-silt-line); & > div { white-space: normal; overflow-wrap: anywhere; }`,
  });

  const sortState = sort.state as { sortKey?: string; reverse?: boolean };
  const visible = useMemo(() => {
    const fn = sortState.sortKey ? sortFns[sortState.sortKey] : undefined;
    if (!fn) return filtered;
    const s = fn(filtered) as T[];
    return sortState.reverse ? s.reverse() : s;
  }, [filtered, sortFns, sortState.sortKey, sortState.reverse]);

  function download() {
    const out = columns.filter((c) => c.csv !== false);
    const csv = toCsv(
      out.map((c) => c.header),
      visible.map((r) => out.map((c) => c.value(r))),
    );
    const blob = new Blob([csv], { type: "text/csv;charset=utf-8" });
    const url = URL.createObjectURL(blob);
    const a = document.createElement("a");
    a.href = url;
    a.download = `${
      csvName ??
      caption
        .toLowerCase()
        .replace(/[^a-z0-9]+/g, "-")
        .replace(/^-|-$/g, "")
    }.csv`;
    document.body.appendChild(a);
    a.click();
    a.remove();
    setTimeout(() => URL.revokeObjectURL(url), 1000);
  }

  return (
    <div className="flex min-w-0 max-w-full flex-col gap-2">
      <div className="flex flex-wrap items-center gap-2">
        <label htmlFor={filterId} className="sr-only">
          Filter {caption}
        </label>
        <input
          id={filterId}
          type="search"
          value={query}
          onChange={(e) => setQuery(e.target.value)}
          placeholder={filterPlaceholder}
          className={sized("h-8 w-72 max-w-full text-sm")}
        />
        <p className="text-sm text-silt-ink tabular" aria-live="polite">
          {filtered.length === rows.length
            ? `${rows.length} ${rows.length === 1 ? "row" : "rows"}`
            : `${filtered.length} of ${rows.length} rows`}
        </p>
        <div className="ml-auto flex items-center gap-2">
          {toolbar}
          <Button variant="secondary" size="sm" onClick={download} disabled={visible.length === 0}>
            Download CSV
          </Button>
        </div>
      </div>
      {rows.length === 0 && empty ? (
        empty
      ) : (
        <div className="relative overflow-x-auto rounded border border-silt-line">
          <Table
            data={data}
            sort={sort}
            theme={theme}
            layout={{ custom: true, horizontalScroll: true }}
            aria-label={caption}
          >
            {(tableList: T[]) => (
              <>
                <Header>
                  {/* the library's default role "rowheader" is not a row: axe and screen readers need "row" */}
                  <HeaderRow role="row">
                    {columns.map((c) =>
                      c.sortable === false ? (
                        <HeaderCell key={c.key} className={c.numeric ? "th-num" : undefined}>
                          {c.header}
                        </HeaderCell>
                      ) : (
                        <HeaderCellSort
                          key={c.key}
                          sortKey={c.key}
                          className={c.numeric ? "th-num" : undefined}
                          aria-sort={
                            sortState.sortKey === c.key
                              ? sortState.reverse
                                ? "descending"
                                : "ascending"
                              : "none"
                          }
                        >
                          {c.header}
                        </HeaderCellSort>
                      ),
                    )}
                  </HeaderRow>
                </Header>
                <Body>
                  {(limit ? tableList.slice(0, limit) : tableList).map((row) => (
                    <Row key={row.id} item={row}>
                      {columns.map((c) => (
                        <Cell key={c.key} className={c.numeric ? "num" : undefined}>
                          {c.render ? c.render(row) : asText(c.value(row))}
                        </Cell>
                      ))}
                    </Row>
                  ))}
                  {tableList.length === 0 ? (
                    <tr className="col-span-full">
                      <td
                        className="px-3 py-4 text-center text-sm text-silt-ink"
                        style={{ gridColumn: "1 / -1" }}
                      >
                        No rows match “{query}”.
                      </td>
                    </tr>
                  ) : null}
                </Body>
              </>
            )}
          </Table>
        </div>
      )}
      {limit ? (
        <div>
          <Button
            variant="secondary"
            size="sm"
            onClick={() => setExpanded(true)}
            data-testid="show-all"
            aria-label={`Show all ${filtered.length} rows of ${caption}`}
          >
            Show all {filtered.length}
          </Button>
          <span className="ml-2 text-sm text-silt-ink">First {limit} shown.</span>
        </div>
      ) : null}
    </div>
  );
}
