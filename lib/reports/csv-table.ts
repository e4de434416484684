// Writes a table as RFC 4180 CSV (CRLF line ends, quotes where needed) through papaparse, with
// text cells that a spreadsheet would run as a formula (= + - @ tab CR first) prefixed by a quote.
import Papa from "papaparse";
import { FORMULA_START } from "./formula-guard";

export type CsvCell = string | number | boolean | null;

export function formatCsv(columns: readonly string[], rows: readonly CsvCell[][]): string {
  for (const [i, row] of rows.entries()) {
    if (row.length !== columns.length)
      throw new RangeError(`row ${i} has ${row.length} cells for ${columns.length} columns`);
  }
  // Numbers are written as numbers (a negative Δλ stays a number); only text is escaped.
  return (
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
    ) + "\r\n"
  );
}
