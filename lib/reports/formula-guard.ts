// The one guard against spreadsheet formula injection in the CSVs Emberline writes (run reports,
// the audit trail, line-table exports): a text cell that a spreadsheet would read as a formula
// (starting with = + - @, a tab or a carriage return) gets a leading apostrophe (common practice).
// Papa's own pattern stops at a line break, hence ours. A cell that already starts with an apostrophe
// the reader would drop (before a formula start or another apostrophe) gets one more, so that every
// text reads back as it was written ("'-" is written "''-").

export const FORMULA_START = /^[=+\-@\t\r]/;

/** Whether the cell starts with an apostrophe that unguardFormulaCell drops. */
function startsWithGuard(cell: string): boolean {
  return cell.startsWith("'") && (FORMULA_START.test(cell.slice(1)) || cell.startsWith("''"));
}

/** The cell as written: prefixed with "'" when it would start a formula, or begins with a guard's apostrophe. */
export function guardFormulaCell(cell: string): string {
  return FORMULA_START.test(cell) || startsWithGuard(cell) ? `'${cell}` : cell;
}

/** Reading back what guardFormulaCell wrote: the apostrophe it added is dropped again. */
export function unguardFormulaCell(cell: string): string {
  return startsWithGuard(cell) ? cell.slice(1) : cell;
}
