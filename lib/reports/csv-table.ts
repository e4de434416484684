// Writes a table as RFC 4180 CSV (CRLF line ends, quotes where needed) through papaparse, with
// text cells that a spreadsheet would run as a formula (= + - @ tab CR first) prefixed by a quote, and
// "# " comment lines above the header that say what the file is.
import Papa from "papaparse";
import { FORMULA_START } from "./formula-guard";

export type CsvCell = string | number | boolean | null;

export interface FormatCsvOptions {
  /**
   * Comment lines above the header row, each written as "# text" (pandas reads them with
   * comment="#", R with comment.char="#"). Commas, semicolons and tabs become " - ", so that a
   * spreadsheet keeps each line in one cell that starts with "#" (never a formula).
   * @default []
   */
  comments?: readonly string[];
}

/** A "# " comment line for the top of a CSV: one line, no cell separator a spreadsheet might split at. */
export function csvComment(text: string): string {
  const flat = text
    .replace(/[\r\n]+/g, " ")
    .replace(/\s*[,;\t]\s*/g, " - ")
    .trim();
  return `# ${flat}`;
}

export function formatCsv(
  columns: readonly string[],
  rows: readonly CsvCell[][],
  options: FormatCsvOptions = {},
): string {
  const { comments = [] } = options;
  for (const [i, row] of rows.entries()) {
    if (row.length !== columns.length)
      throw new RangeError(`row ${i} has ${row.length} cells for ${columns.length} columns`);
  }
  // Numbers are written as numbers (a negative Δλ stays a number); only text is escaped.
  return (
    comments.map((c) => `${csvComment(c)}\r\n`).join("") +
    Papa.unparse(
      {
        fields: [...columns],
        data: rows.map((r) =>
          r.map((c) => (typeof c === "number" && !Number.isFinite(c) ? null : c)),
        ),
      },
      {
        newline: "\r\n",
        escapeFormulae: FORMULA_START,
      },
    ) +
    "\r\n"
  );
}
