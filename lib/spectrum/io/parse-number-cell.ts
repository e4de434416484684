// Strict, linear-time reading of one numeric cell; a hand scanner because Number() accepts "", "0x1F" and " 7 ".

/**
 * The value of `cell` as a decimal number (optional sign, digits with one `decimal` separator,
 * optional exponent), or NaN when the cell is anything else. NaN/Infinity literals and overflow to
 * ±Infinity also give NaN; `describeBadCell` says which problem it was.
 */
export function parseNumberCell(cell: string, decimal: "." | "," = "."): number {
  const length = cell.length;
  let i = 0;
  let code = cell.charCodeAt(0);
  if (code === 43 || code === 45) code = cell.charCodeAt(++i); // + or -
  let digits = 0;
  while (code >= 48 && code <= 57) {
    digits++;
    code = cell.charCodeAt(++i);
  }
  let separatorAt = -1;
  if (code === (decimal === "." ? 46 : 44)) {
    separatorAt = i;
    code = cell.charCodeAt(++i);
    while (code >= 48 && code <= 57) {
      digits++;
      code = cell.charCodeAt(++i);
    }
  }
  if (digits === 0) return NaN;
  if (code === 69 || code === 101) {
    // e or E
    code = cell.charCodeAt(++i);
    if (code === 43 || code === 45) code = cell.charCodeAt(++i);
    let exponentDigits = 0;
    while (code >= 48 && code <= 57) {
      exponentDigits++;
      code = cell.charCodeAt(++i);
    }
    if (exponentDigits === 0) return NaN;
  }
  if (i !== length) return NaN;
  const value =
    separatorAt >= 0 && decimal === ","
      ? Number(cell.slice(0, separatorAt) + "." + cell.slice(separatorAt + 1))
      : Number(cell);
  return Number.isFinite(value) ? value : NaN;
}
