// The one guard against spreadsheet formula injection in the CSVs Emberline writes (run reports,
// the audit trail, line-table exports): a text cell that a spreadsheet would read as a formula
// (starting with = + - @, a tab or a carriage return) gets a leading apostrophe (common practice).
// Papa's own pattern stops at a line break, hence ours.

export const FORMULA_START = /^[=+\-@\t\r]/;

/** The cell as written: prefixed with "'" when it would start a formula. */
export function guardFormulaCell(cell: string): string {
  return FORMULA_START.test(cell) ? `'${cell}` : cell;
}

/** Reading back what guardFormulaCell wrote: the apostrophe it added is dropped again. */
export function unguardFormulaCell(cell: string): string {
  return cell.startsWith("'") && FORMULA_START.test(cell.slice(1)) ? cell.slice(1) : cell;
}
