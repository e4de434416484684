// Writes line-table rows as Emberline's CSV (release export, the starter table); parseLineTableCsv reads it back unchanged.

import Papa from "papaparse";

import { guardFormulaCell } from "../reports/formula-guard";
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

/** Shortest text that reads back as the same number; blank for null. */
function numberCell(value: number | null | undefined): string {
  return value === null || value === undefined ? "" : String(value);
}

/** Transition probabilities read best in exponent form ("6.16e+7"), which still reads back exactly. */
function exponentCell(value: number | null): string {
  return value === null ? "" : value.toExponential();
}

function rowCells(row: LineTableRow): string[] {
  const cells: Record<string, string> = {
    // Text cells are guarded against formula injection; parseLineTableCsv drops the guard again.
    species: guardFormulaCell(row.species),
    air_nm: numberCell(row.airNm),
    vacuum_nm: numberCell(row.vacuumNm),
    uncertainty_nm: numberCell(row.uncertaintyNm),
    intensity_flame: numberCell(row.intensities.flame),
    intensity_arc: numberCell(row.intensities.arc),
    intensity_spark: numberCell(row.intensities.spark),
    intensity_plasma: numberCell(row.intensities.plasma),
    intensity_lamp: numberCell(row.intensities.lamp),
    lower_ev: numberCell(row.lowerEv),
    upper_ev: numberCell(row.upperEv),
    g_upper: numberCell(row.gUpper),
    a_per_s: exponentCell(row.aPerS),
    flags: guardFormulaCell(row.flags.join(";")),
    band_extent_nm: numberCell(row.band?.extentNm),
    band_degrades_to: guardFormulaCell(row.band?.degradesTo ?? ""),
    source: guardFormulaCell(row.source),
    verified: row.verified ? "true" : "false",
    note: guardFormulaCell(row.note),
  };
  return LINE_TABLE_COLUMN_NAMES.map((name) => cells[name]);
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
          data: rows.map((row, i) => [lineKeys[i], ...rowCells(row)]),
        }
      : { fields: [...LINE_TABLE_COLUMN_NAMES], data: rows.map(rowCells) },
    { newline: "\n", quotes: false },
  );
  // Papa.unparse ends a data-less table with a line break and a full one without; end both with one.
  return [...header, body.replace(/\n$/, "")].join("\n") + "\n";
}
