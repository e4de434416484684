// The bounds a line-table import and a reference check hold a CSV to before any lock or parse: not
// blank, at most so many bytes and so many rows. Each use case words its own refusals.
import type { AppError } from "@/lib/errors";

/** A file's bounds, and the refusal of each (the use cases word them differently). */
export interface CsvLimits {
  maxBytes: number;
  maxRows: number;
  empty: () => AppError;
  tooLarge: () => AppError;
  /** `rows` is the file's count and `limit` maxRows, both written as "20,000". */
  tooManyRows: (rows: string, limit: string) => AppError;
}

/** Throws the use case's refusal for a blank file, one over maxBytes (UTF-8) or one over maxRows. */
export function assertCsvWithinLimits(csvText: string, limits: CsvLimits): void {
  if (typeof csvText !== "string" || csvText.trim() === "") throw limits.empty();
  if (Buffer.byteLength(csvText, "utf8") > limits.maxBytes) throw limits.tooLarge();
  // Counted before any lock or parse: a record takes at least one line, so this never undercounts.
  const rows = countDataLines(csvText);
  if (rows > limits.maxRows) {
    throw limits.tooManyRows(rows.toLocaleString("en"), limits.maxRows.toLocaleString("en"));
  }
}

/** Lines that are neither blank nor # comments, less the header: an upper bound of the file's records. */
function countDataLines(csvText: string): number {
  let count = 0;
  let start = 0;
  while (start <= csvText.length) {
    let end = csvText.indexOf("\n", start);
    if (end < 0) end = csvText.length;
    let i = start;
    while (
      i < end &&
      (csvText[i] === " " || csvText[i] === "\t" || csvText[i] === "\r" || csvText[i] === "\uFEFF")
    )
      i++;
    if (i < end && csvText[i] !== "#") count++;
    start = end + 1;
  }
  return Math.max(0, count - 1);
}
