/**
 * Export of a study's pool for the modelling work: every accepted row, read again from the
 * stored files and streamed as one CSV with provenance columns, and a data dictionary of the
 * plan with the pool's figures. Cells are formula-safe (lib/format csvCell).
 */
import { csvCell } from "@/lib/format";
import { csvRecords, type PlanColumn } from "@/lib/readiness";
import { poolFigures, type PoolFigures, type StudyPool } from "./pool";

/** Opens a stored file by key (the upload service's openStoredFile, or a stand-in in tests). */
export type OpenFile = (key: string) => Promise<ReadableStream<Uint8Array>>;

export const PROVENANCE_COLUMNS = ["organisation", "batch", "batch_title", "version", "source_row"] as const;

const line = (cells: readonly unknown[]) => cells.map(csvCell).join(",") + "\r\n";

function isNumeric(c: PlanColumn) {
  return c.type === "number" || c.type === "integer";
}

/**
 * The pool's rows as CSV lines: provenance columns (organisation, batch id, batch title,
 * version, the row's line number in its file as the readiness report gives it: the line the
 * record starts on, the header being line 1, quoted line breaks and blank lines counted), then the plan's
 * columns in plan order. Values are as sent, except numeric columns of a file written with
 * decimal commas, whose commas become points so every row reads the same way.
 */
export async function* poolCsvLines(
  pool: StudyPool,
  openFile: OpenFile,
  counter?: { rows: number },
): AsyncGenerator<string> {
  const cols = pool.plan.columns;
  yield line([...PROVENANCE_COLUMNS, ...cols.map((c) => c.name)]);
  for (const m of pool.members) {
    let index: (number | undefined)[] | null = null;
    // the engine's reader (UTF-8 only, lib/readiness/decode.ts): an accepted file reads as it was checked
    for await (const { kind, line: lineNo, fields: rec } of csvRecords(
      await openFile(m.fileKey),
      m.delimiter ? { delimiter: m.delimiter } : {},
    )) {
      if (kind === "header" || !index) {
        const header = rec.map((h) => h.trim());
        index = cols.map((c) => {
          const at = header.indexOf(c.name);
          return at >= 0 ? at : undefined;
        });
        continue;
      }
      const values = cols.map((c, j) => {
        const at = index![j];
        const raw = at === undefined ? "" : (rec[at] ?? "");
        return isNumeric(c) && m.decimal === "," ? raw.trim().replace(",", ".") : raw;
      });
      if (counter) counter.rows++;
      yield line([m.organisationName, m.batchPublicId, m.batchTitle, m.version, lineNo, ...values]);
    }
  }
}

/** The pool's CSV as a byte stream pulled line by line (back-pressure from the client). */
export function poolCsvStream(
  pool: StudyPool,
  openFile: OpenFile,
  counter?: { rows: number },
): ReadableStream<Uint8Array> {
  const it = poolCsvLines(pool, openFile, counter);
  const enc = new TextEncoder();
  return new ReadableStream<Uint8Array>({
    async pull(controller) {
      try {
        // a few hundred lines per chunk keeps the number of enqueues sane for big pools
        let chunk = "";
        for (let i = 0; i < 256; i++) {
          const next = await it.next();
          if (next.done) {
            if (chunk) controller.enqueue(enc.encode(chunk));
            controller.close();
            return;
          }
          chunk += next.value;
        }
        controller.enqueue(enc.encode(chunk));
      } catch (e) {
        controller.error(e);
      }
    },
    async cancel() {
      await it.return(undefined);
    },
  });
}

export type DictionaryEntry = {
  name: string;
  role: string;
  type: string;
  description: string | null;
  levels: string[] | null;
  baseline: string | null;
  openLevels: boolean;
  min: number | null;
  max: number | null;
  missingTokens: string[];
  sentinels: number[];
  /** pool figures for the column */
  poolMissing: number | null;
  poolMissingFraction: number | null;
  poolLevels: { level: string; count: number }[] | null;
  poolSummary: {
    min: number;
    q1: number;
    median: number;
    q3: number;
    max: number;
    mean: number;
    sd: number;
  } | null;
};

export type DataDictionary = {
  study: { slug: string; title: string; planVersion: number };
  generatedAt: string;
  model: {
    intercept: boolean;
    terms: { term: string; columns: string[]; df: number }[];
    interactions: [string, string][];
  };
  pool: PoolFigures & {
    perParameter: number | null;
    rSquared: number | null;
    adjRSquared: number | null;
  };
  provenanceColumns: readonly string[];
  columns: DictionaryEntry[];
  members: {
    organisation: string;
    batch: string;
    title: string;
    version: number;
    file: string;
    rows: number;
  }[];
};

/** The data dictionary: the plan's columns (roles, types, levels with baseline, ranges, missing tokens) and the pool's figures. */
export function dataDictionary(pool: StudyPool, now = new Date()): DataDictionary {
  const r = pool.report;
  const byName = new Map(r.columns.map((c) => [c.name, c]));
  return {
    study: { slug: pool.slug, title: pool.title, planVersion: pool.planVersion },
    generatedAt: now.toISOString(),
    model: { intercept: pool.plan.intercept, terms: r.model.terms, interactions: pool.plan.interactions },
    pool: {
      ...poolFigures(pool),
      perParameter: r.model.perParameter,
      rSquared: r.fit?.rSquared ?? null,
      adjRSquared: r.fit?.adjRSquared ?? null,
    },
    provenanceColumns: PROVENANCE_COLUMNS,
    columns: pool.plan.columns.map((c) => {
      const col = byName.get(c.name);
      return {
        name: c.name,
        role: c.role,
        type: c.type,
        description: c.description ?? null,
        levels: c.levels ?? null,
        baseline: c.type === "category" ? (c.baseline ?? c.levels?.[0] ?? null) : null,
        openLevels: c.openLevels ?? false,
        min: c.min ?? null,
        max: c.max ?? null,
        missingTokens: [...new Set([...pool.plan.missingTokens, ...(c.missingTokens ?? [])])],
        sentinels: c.sentinels ?? [],
        poolMissing: col?.missing.count ?? null,
        poolMissingFraction: col?.missing.fraction ?? null,
        poolLevels: col?.levels ?? null,
        poolSummary: col?.summary ?? null,
      };
    }),
    members: pool.members.map((m) => ({
      organisation: m.organisationName,
      batch: m.batchPublicId,
      title: m.batchTitle,
      version: m.version,
      file: m.fileName,
      rows: m.rowsTotal,
    })),
  };
}

const list = (xs: readonly (string | number)[] | null) =>
  xs ? xs.map((x) => (x === "" ? "(empty)" : String(x))).join(" | ") : "";

/** The dictionary's columns as CSV, one row per plan column; the pool figures as leading comment-free summary rows. */
export function dataDictionaryCsv(d: DataDictionary): string {
  const header = [
    "column",
    "role",
    "type",
    "description",
    "levels",
    "baseline",
    "open_levels",
    "min",
    "max",
    "missing_tokens",
    "sentinels",
    "pool_missing",
    "pool_missing_fraction",
    "pool_level_counts",
    "pool_mean",
    "pool_sd",
    "pool_min",
    "pool_max",
  ];
  const rows = d.columns.map((c) => [
    c.name,
    c.role,
    c.type,
    c.description,
    list(c.levels),
    c.baseline,
    c.openLevels,
    c.min,
    c.max,
    list(c.missingTokens),
    list(c.sentinels),
    c.poolMissing,
    c.poolMissingFraction,
    c.poolLevels ? c.poolLevels.map((l) => `${l.level}=${l.count}`).join(" | ") : "",
    c.poolSummary?.mean,
    c.poolSummary?.sd,
    c.poolSummary?.min,
    c.poolSummary?.max,
  ]);
  const p = d.pool;
  const figures = [
    ["pool_figure", "value"],
    ["study", d.study.slug],
    ["plan_version", d.study.planVersion],
    ["batches", p.batches],
    ["rows", p.rows],
    ["complete_cases", p.completeCases],
    ["parameters", p.parameters],
    ["residual_df", p.residualDf],
    ["df_target", p.dfTarget],
    ["df_headroom", p.headroom],
    ["rows_per_parameter", p.perParameter],
    ["r_squared", p.rSquared],
    ["adj_r_squared", p.adjRSquared],
  ];
  return [header, ...rows].map(line).join("") + "\r\n" + figures.map(line).join("");
}

/** The name of an export file: `<slug>-pool-<what>-<yyyy-mm-dd>.<ext>`. */
export function exportFileName(
  slug: string,
  what: "rows" | "dictionary",
  ext: "csv" | "json",
  now = new Date(),
): string {
  return `${slug}-pool-${what}-${now.toISOString().slice(0, 10)}.${ext}`;
}
