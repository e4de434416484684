// Writes line-table rows as Emberline's CSV (release export, the starter table); parseLineTableCsv reads it back unchanged.

import Papa from "papaparse";

import { lineTableCells } from "./line-table-cells";
import { LINE_KEY_COLUMN, LINE_TABLE_COLUMNS, LINE_TABLE_COLUMN_NAMES } from "./line-table-columns";
import type { LineTableRow } from "./types";

export interface FormatLineTableCsvOptions {
  /**
   * Free comment lines for the top of the file (title, release, sources); each becomes a "# " line.
   * @default []
   */
  comments?: readonly string[];
  /**
   * Write the meaning of every column into the comment header, so the file documents itself.
   * @default true
   */
  describeColumns?: boolean;
  /**
   * Each row's line key, in the order of the rows: given, a line_key column is written first, so the
   * file can be re-imported onto the same lines.
   * @default undefined (no line_key column)
   */
  lineKeys?: readonly string[];
}

/** Formats rows as CSV text: comment header, header row, one line per row, "\n" line ends. */
export function formatLineTableCsv(
  rows: readonly LineTableRow[],
  options: FormatLineTableCsvOptions = {},
): string {
  const { comments = [], describeColumns = true, lineKeys } = options;
  if (!Array.isArray(rows)) throw new RangeError("rows must be an array");
  if (lineKeys !== undefined && lineKeys.length !== rows.length) {
    throw new RangeError(
      `lineKeys must hold one key per row (${rows.length}), got ${lineKeys.length}`,
    );
  }
  const header: string[] = [];
  for (const comment of comments) {
    for (const line of comment.split(/\r?\n/)) header.push(line === "" ? "#" : `# ${line}`);
  }
  if (describeColumns) {
    header.push("# Columns:");
    for (const column of LINE_TABLE_COLUMNS) {
      header.push(
        `#   ${column.name}${column.required ? " (required)" : ""}: ${column.description}`,
      );
    }
  }
  const body = Papa.unparse(
    lineKeys
      ? {
          fields: [LINE_KEY_COLUMN, ...LINE_TABLE_COLUMN_NAMES],
          data: rows.map((row, i) => [lineKeys[i], ...lineTableCells(row).values()]),
        }
      : {
          fields: [...LINE_TABLE_COLUMN_NAMES],
          data: rows.map((row) => [...lineTableCells(row).values()]),
        },
    { newline: "\n", quotes: false },
  );
  // Papa.unparse ends a data-less table with a line break and a full one without; end both with one.
  return [...header, body.replace(/\n$/, "")].join("\n") + "\n";
}
