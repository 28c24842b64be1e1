/**
 * The load batches: invented barley plot results (the demo generator of lib/demo/batches.ts,
 * a different seed per provider), each wrapped once in the multipart body of
 * `POST /api/v1/batches`, so sending it costs the load script nothing.
 */
import { randomBytes } from "node:crypto";
import { BARLEY_HEADER, barleyRows, toCsv } from "@/lib/demo/batches";

export interface UploadBody {
  fileName: string;
  rows: number;
  csvBytes: number;
  headers: Record<string, string>;
  body: Buffer;
}

/** A multipart/form-data body with the fields `study`, `label` and `file` (text/csv). */
export function multipartUpload(
  token: string,
  studySlug: string,
  label: string,
  fileName: string,
  csv: string,
): { headers: Record<string, string>; body: Buffer } {
  const boundary = `----tributary-load-${randomBytes(12).toString("hex")}`;
  const field = (name: string, value: string) =>
    `--${boundary}\r\nContent-Disposition: form-data; name="${name}"\r\n\r\n${value}\r\n`;
  const body = Buffer.concat([
    Buffer.from(field("study", studySlug) + field("label", label)),
    Buffer.from(
      `--${boundary}\r\nContent-Disposition: form-data; name="file"; filename="${fileName}"\r\nContent-Type: text/csv\r\n\r\n`,
    ),
    Buffer.from(csv, "utf8"),
    Buffer.from(`\r\n--${boundary}--\r\n`),
  ]);
  return {
    headers: {
      authorization: `Bearer ${token}`,
      "content-type": `multipart/form-data; boundary=${boundary}`,
    },
    body,
  };
}

/** Provider k's batch: `rows` plot rows from seed 7000 + k, as the upload body. */
export function loadBatch(k: number, rows: number, token: string, studySlug: string): UploadBody {
  const code = `L${String(k + 1).padStart(2, "0")}`;
  const csv = toCsv(BARLEY_HEADER, barleyRows(code, rows, 7000 + k));
  const fileName = `load-farm-${String(k + 1).padStart(2, "0")}-plots.csv`;
  const { headers, body } = multipartUpload(token, studySlug, `Load batch ${k + 1}`, fileName, csv);
  return { fileName, rows, csvBytes: Buffer.byteLength(csv), headers, body };
}
