// The text of each cell of a line-table row: what an export writes, and what a typed line is checked
// as (readLineTableRow reads the cells back exactly as parseLineTableCsv reads an exported file).

import { guardFormulaCell } from "../reports/formula-guard";
import { LINE_TABLE_COLUMN_NAMES } from "./line-table-columns";
import type { LineTableRow } from "./types";

/** Shortest text that reads back as the same number; blank for null. */
function numberCell(value: number | null | undefined): string {
  return value === null || value === undefined ? "" : String(value);
}

/** Transition probabilities read best in exponent form ("6.16e+7"), which still reads back exactly. */
function exponentCell(value: number | null): string {
  return value === null ? "" : value.toExponential();
}

/** The row's cells by column name, in the order of LINE_TABLE_COLUMNS. */
export function lineTableCells(row: LineTableRow): Map<string, string> {
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
  return new Map(LINE_TABLE_COLUMN_NAMES.map((name) => [name, cells[name]]));
}
