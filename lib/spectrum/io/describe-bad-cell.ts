// Turns a cell that parseNumberCell refused into a located SpectrumParseError that says what is wrong with it.
import { parseNumberCell } from "./parse-number-cell";
import { SpectrumParseError } from "./spectrum-parse-error";

const NON_FINITE_WORDS = new Set([
  "nan",
  "inf",
  "infinity",
  "+inf",
  "-inf",
  "+infinity",
  "-infinity",
  "+nan",
  "-nan",
]);
const SHOWN_CHARACTERS = 40;

/** The error for the unreadable `cell` at 1-based `line` and `column`. */
export function describeBadCell(
  cell: string,
  line: number,
  column: number,
  decimal: "." | ",",
): SpectrumParseError {
  if (cell.length === 0)
    return new SpectrumParseError("empty-cell", "the cell is empty", line, column);
  const shown = cell.length > SHOWN_CHARACTERS ? `${cell.slice(0, SHOWN_CHARACTERS)}…` : cell;
  if (NON_FINITE_WORDS.has(cell.toLowerCase())) {
    return new SpectrumParseError("not-finite", `"${shown}" is not a finite number`, line, column);
  }
  // Same grammar but too large for a double (1e999): a number, just not a finite one.
  if (Number.isNaN(parseNumberCell(cell, decimal)) && looksNumeric(cell, decimal)) {
    return new SpectrumParseError(
      "not-finite",
      `"${shown}" is too large to be a finite number`,
      line,
      column,
    );
  }
  const other = decimal === "." ? "," : ".";
  const hint = looksNumeric(cell.replace(other, decimal), decimal)
    ? ` (the file's decimal separator is "${decimal}")`
    : "";
  return new SpectrumParseError("non-numeric", `"${shown}" is not a number${hint}`, line, column);
}

function looksNumeric(cell: string, decimal: "." | ","): boolean {
  const pattern =
    decimal === "."
      ? /^[+-]?(?:\d+\.?\d*|\.\d+)(?:[eE][+-]?\d+)?$/
      : /^[+-]?(?:\d+,?\d*|,\d+)(?:[eE][+-]?\d+)?$/;
  // Only reached on the error path and for cells already refused, so the regex runs once per file.
  return cell.length <= 400 && pattern.test(cell);
}
