/**
 * "Rows at fault" for providers: the batch's original rows that carry findings, with the
 * finding codes and messages beside them, as CSV that is safe to open in a spreadsheet.
 */
import { csvCell } from "@/lib/format";
import { rowsAtFault, parsePlan, type ReadinessReport } from "@/lib/readiness";

export type OpenFile = (key: string) => Promise<ReadableStream<Uint8Array>>;

/** The CSV as a stream: `line`, the file's own columns, then `finding_codes` and `findings`. */
export function rowsAtFaultCsv(opts: {
  fileKey: string;
  plan: unknown;
  report: ReadinessReport;
  openFile: OpenFile;
}): ReadableStream<Uint8Array> {
  const parsed = parsePlan(opts.plan);
  if (!parsed.ok) throw new Error("the version's data plan does not parse");
  const plan = parsed.plan;
  const enc = new TextEncoder();
  const line = (cells: unknown[]) => enc.encode(cells.map(csvCell).join(",") + "\r\n");
  let iterator: AsyncGenerator<{
    kind: "header" | "row";
    line: number;
    fields: string[];
    faults: { code: string; column: string | null; message: string }[];
  }> | null = null;
  let width = 0;
  let wroteHeader = false;
  return new ReadableStream<Uint8Array>({
    async start() {
      const stream = await opts.openFile(opts.fileKey);
      iterator = rowsAtFault(stream, plan, { report: opts.report });
    },
    async pull(controller) {
      const next = await iterator!.next();
      if (next.done) {
        if (!wroteHeader) controller.enqueue(line(["line", "finding_codes", "findings"]));
        controller.close();
        return;
      }
      const item = next.value;
      const codes = [...new Set(item.faults.map((f) => f.code))].join("; ");
      const messages = item.faults
        .map((f) => (f.column ? `${f.column}: ${f.message}` : f.message))
        .join(" | ");
      if (item.kind === "header") {
        width = item.fields.length;
        wroteHeader = true;
        controller.enqueue(line(["line", ...item.fields, "finding_codes", "findings"]));
        if (item.faults.length) controller.enqueue(line([1, ...item.fields.map(() => ""), codes, messages]));
        return;
      }
      const fields =
        item.fields.length >= width
          ? item.fields
          : [...item.fields, ...Array(width - item.fields.length).fill("")];
      controller.enqueue(line([item.line, ...fields, codes, messages]));
    },
    async cancel() {
      await iterator?.return(undefined);
    },
  });
}
