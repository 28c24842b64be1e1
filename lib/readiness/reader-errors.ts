/** The reader's refusals of a file, in words a provider can act on (./tokenizer.ts). */
import { UnreadableError } from "./decode";

export function fieldTooLong(line: number, field: number, bytes: number, max: number): UnreadableError {
  return new UnreadableError(
    `Line ${line}, field ${field} holds ${bytes.toLocaleString("en")} bytes; the engine reads fields of at most ${max.toLocaleString("en")}.`,
    `Check line ${line}: a quote may be left open, or the cell holds something other than data (a picture, a document). Remove it and export again.`,
    { kind: "field-too-long", line },
  );
}

export function unclosedQuote(line: number): UnreadableError {
  return new UnreadableError(
    `A quoted field that starts on line ${line} is never closed: the rest of the file was read as one value.`,
    `Check line ${line}: every opening " needs a closing " (write a quote inside a quoted value as "").`,
    { kind: "unclosed-quote", line },
  );
}

/** A record that outgrew the cap: an open quote, or a line without a break. */
export function recordTooLong(line: number, open: boolean, maxBytes: number): UnreadableError {
  const mb = Math.max(1, Math.round(maxBytes / (1 << 20)));
  return new UnreadableError(
    open
      ? `A quoted field that starts on line ${line} is never closed: more than ${mb} MB of text follows without the closing quote.`
      : `Line ${line} runs on for more than ${mb} MB without a line break; this is not a line-based CSV file.`,
    open
      ? `Check line ${line}: every opening " needs a closing " (write a quote inside a quoted value as "").`
      : "Export the data again as CSV with one row per line; check that the file is not a single long line of data or a different format.",
    { kind: open ? "unclosed-quote" : "line-too-long", line },
  );
}
