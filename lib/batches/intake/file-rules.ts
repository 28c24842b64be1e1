/**
 * What a batch file must be before it is stored, said the same way in the browser and on
 * the server: not empty, a CSV/TSV/text file, within the size limit. And what its name
 * becomes: a plain base name, safe to store, show and send as a download name.
 */
export const BATCH_FILE_EXTENSIONS = /\.(csv|tsv|txt)$/i;

import { formatBytes } from "@/lib/format";

/** Longest stored file name, in characters (the column holds 300). */
export const MAX_FILE_NAME_CHARS = 200;

// C0 and C1 controls, DEL; bidi embeddings, overrides and isolates (U+202A–202E, U+2066–2069,
// LRM/RLM/ALM) that can make "x\u202Evsc.exe" read as "xexe.csv"; zero-width characters and BOM
const INVISIBLE = /[\u0000-\u001f\u007f-\u009f\u061c\u200b-\u200f\u202a-\u202e\u2060-\u2069\ufeff]/g;
// reserved in file names on Windows, and the HTML/quote characters a careless consumer might not escape
const RESERVED = /[<>:"/\\|?*`]/g;
const WINDOWS_DEVICE = /^(con|prn|aux|nul|com\d|lpt\d)$/i;

/** Text a user typed (a batch label): without control, bidi-override or zero-width characters, spaces collapsed. */
export function cleanText(text: string, maxChars = 300): string {
  const s = text.normalize("NFC").replace(INVISIBLE, " ").replace(/\s+/g, " ").trim();
  return Array.from(s).slice(0, maxChars).join("").trim();
}

/**
 * A file name as stored and shown: the last path segment only (`../../etc/passwd.csv` →
 * `passwd.csv`, `..\x.csv` → `x.csv`), without control, bidi-override or zero-width
 * characters, Windows-reserved and markup characters replaced by `_`, no leading dots, at
 * most MAX_FILE_NAME_CHARS characters with the extension kept; `batch.csv` when nothing is
 * left. Applying it twice changes nothing.
 */
export function cleanFileName(name: string): string {
  const base = name.split(/[\\/]/).pop() ?? "";
  let s = base.normalize("NFC").replace(INVISIBLE, "").replace(RESERVED, "_").replace(/\s+/g, " ");
  s = s.replace(/^[\s.]+/, "").replace(/[\s.]+$/, "");
  const dot = s.lastIndexOf(".");
  let stem = dot > 0 ? s.slice(0, dot) : s;
  const ext = dot > 0 ? s.slice(dot) : "";
  if (WINDOWS_DEVICE.test(stem)) stem = `_${stem}`;
  const extChars = Array.from(ext);
  const room = MAX_FILE_NAME_CHARS - Math.min(extChars.length, 16);
  const out = (Array.from(stem).slice(0, room).join("").trimEnd() + extChars.slice(0, 16).join("")).replace(
    /[\s.]+$/,
    "",
  );
  return out && out !== ext ? out : out ? `batch${out}` : "batch.csv";
}

/**
 * A Content-Disposition header for a download: an ASCII fallback name (letters, digits,
 * `.`, `_`, `-`) and the UTF-8 name in `filename*` (RFC 6266 §4.3, RFC 8187), so no quote,
 * semicolon, line break or path survives into the header.
 */
export function attachmentDisposition(fileName: string): string {
  const clean = cleanFileName(fileName);
  const toAscii = (t: string) =>
    t
      .normalize("NFKD")
      .replace(/[\u0300-\u036f]/g, "")
      .replace(/[^A-Za-z0-9._-]+/g, "-")
      .replace(/-+/g, "-");
  const dot = clean.lastIndexOf(".");
  const stem = toAscii(dot > 0 ? clean.slice(0, dot) : clean).replace(/^[-.]+|[-.]+$/g, "") || "download";
  const ascii = stem + (dot > 0 ? toAscii(clean.slice(dot)).replace(/-+$/, "") : "");
  const encoded = encodeURIComponent(clean).replace(
    /['()*]/g,
    (c) => `%${c.charCodeAt(0).toString(16).toUpperCase()}`,
  );
  return `attachment; filename="${ascii}"; filename*=UTF-8''${encoded}`;
}

/** Why a file may not be uploaded, with the HTTP-facing kind (empty 422, too large 413, not CSV 415), or null. */
export function batchFileRefusal(
  file: { name: string; size: number },
  maxUploadMb: number,
): { code: "invalid" | "too_large" | "unsupported_type"; message: string } | null {
  if (file.size === 0)
    return {
      code: "invalid",
      message: `"${file.name}" is empty (0 bytes). Choose the file that holds the batch.`,
    };
  if (file.size > maxUploadMb * 1024 * 1024) {
    const message = `"${file.name}" is ${formatBytes(file.size)}; the limit is ${maxUploadMb} MB. Split the batch into smaller files.`;
    return { code: "too_large", message };
  }
  if (!BATCH_FILE_EXTENSIONS.test(file.name)) {
    const message = `"${file.name}" is not a CSV file. Export the data as CSV (comma, semicolon or tab separated) and send that file.`;
    return { code: "unsupported_type", message };
  }
  return null;
}

/** A plain message saying what to fix, or null when the file may be uploaded. */
export function batchFileProblem(file: { name: string; size: number }, maxUploadMb: number): string | null {
  return batchFileRefusal(file, maxUploadMb)?.message ?? null;
}
