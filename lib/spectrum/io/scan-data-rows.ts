// Reads the data rows of a plain delimited text straight into typed arrays, without line or cell strings.
// It answers only for rows it is sure about; anything unusual (quotes, a bad or empty cell, a column too
// many or too few, a lone CR, non-ASCII text) returns null so that the line-by-line reader names the problem.
import { parseNumberCell } from "./parse-number-cell";
import { assertNonNegativeIntegers } from "./assert-decode-options";
import { growFloat64, growInt32 } from "./grow-typed-array";
import type { TextDelimiter } from "./text-delimiter";
import { DEFAULT_MAX_POINTS } from "./spectrum-read-options";

export interface ScanDataRowsOptions {
  /**
   * Offset in `text` of the first character of the first data row.
   * @default 0
   */
  start?: number;
  /**
   * 1-based line number of the line that begins at `start`.
   * @default 1
   */
  firstLine?: number;
  /**
   * Column separator, as detected from the first rows.
   * @default "comma"
   */
  delimiter?: TextDelimiter;
  /**
   * Decimal separator, as detected from the first rows.
   * @default "."
   */
  decimalSeparator?: "." | ",";
  /**
   * Number of columns every data row must have (trailing empty cells not counted).
   * @default 2
   */
  columnCount?: number;
  /**
   * 0-based column of x.
   * @default 0
   */
  xIndex?: number;
  /**
   * 0-based column of y.
   * @default 1
   */
  yIndex?: number;
  /**
   * Largest number of data rows; one more gives up (the line reader then reports "too-large").
   * @default 2000000
   */
  maxRows?: number;
}

export interface ScannedRows {
  /** x of each data row, in file order. */
  x: Float64Array;
  /** y of each data row, in file order. */
  y: Float64Array;
  /** 1-based file line of each data row. */
  lines: Int32Array;
}

const TAB = 9;
const LF = 10;
const CR = 13;
const SPACE = 32;
const QUOTE = 34;
const HASH = 35;
const PERCENT = 37;
const PLUS = 43;
const MINUS = 45;
const SLASH = 47;
const SEMICOLON = 59;
const SEPARATOR_CODES: Record<TextDelimiter, number> = {
  tab: TAB,
  semicolon: SEMICOLON,
  comma: 44,
  whitespace: -1,
};
/** Decimal mantissas up to 15 digits are exact doubles, so one division by an exact 10^k rounds correctly. */
const MAX_EXACT_DIGITS = 15;
const POWERS_OF_TEN = Float64Array.from({ length: MAX_EXACT_DIGITS + 1 }, (_, k) => 10 ** k);
const INITIAL_CAPACITY = 4096;

/**
 * The x and y of every data row of `text` from `options.start` on, skipping blank and comment lines
 * as the line reader does, or null at the first thing the line reader would treat differently or refuse.
 * Numbers equal Number() of the cell: short decimals are built exactly, longer ones and exponents go
 * through parseNumberCell.
 */
export function scanDataRows(text: string, options: ScanDataRowsOptions = {}): ScannedRows | null {
  const {
    start = 0,
    firstLine = 1,
    delimiter = "comma",
    decimalSeparator = ".",
    columnCount = 2,
    xIndex = 0,
    yIndex = 1,
    maxRows = DEFAULT_MAX_POINTS,
  } = options;
  if (!(delimiter in SEPARATOR_CODES)) {
    throw new RangeError(`unknown delimiter ${JSON.stringify(delimiter)}`);
  }
  if (decimalSeparator !== "." && decimalSeparator !== ",") {
    throw new RangeError(
      `decimalSeparator must be "." or ",", got ${JSON.stringify(decimalSeparator)}`,
    );
  }
  assertNonNegativeIntegers({ start, firstLine, columnCount, xIndex, yIndex, maxRows });
  if (xIndex >= columnCount || yIndex >= columnCount || xIndex === yIndex) {
    throw new RangeError(
      `xIndex ${xIndex} and yIndex ${yIndex} must be distinct columns below ${columnCount}`,
    );
  }

  const separator = SEPARATOR_CODES[delimiter];
  const whitespace = separator < 0;
  // A cell's surrounding blanks are trimmed; a tab is only a blank when it does not separate the columns.
  const tabIsBlank = separator !== TAB;
  // When the decimal mark is also the separator (commas for both), a cell cannot hold it.
  const decimalCode = decimalSeparator === "." ? 46 : 44;
  const decimal = decimalCode === separator ? -1 : decimalCode;
  const length = text.length;

  let capacity = INITIAL_CAPACITY;
  let xs = new Float64Array(capacity);
  let ys = new Float64Array(capacity);
  let lineNumbers = new Int32Array(capacity);
  let n = 0;
  let line = firstLine;
  let position = start;

  while (position < length) {
    // Classify the line as the line reader does: blank, comment, or content.
    let p = position;
    let code = text.charCodeAt(p);
    while (code === SPACE || code === TAB) code = text.charCodeAt(++p);
    if (p >= length) break;
    if (code === LF || code === CR) {
      if (code === CR && text.charCodeAt(p + 1) !== LF) return null;
      position = p + (code === CR ? 2 : 1);
      line++;
      continue;
    }
    if (
      code === HASH ||
      code === PERCENT ||
      (code === SLASH && text.charCodeAt(p + 1) === SLASH) ||
      (code === SEMICOLON && separator !== SEMICOLON)
    ) {
      const newline = text.indexOf("\n", p);
      const stop = newline < 0 ? length : newline;
      // A CR anywhere but before the LF would end the line there for the line reader.
      for (let q = p; q < stop; q++) {
        if (text.charCodeAt(q) === CR && q + 1 !== stop) return null;
      }
      position = stop + 1;
      line++;
      continue;
    }

    if (n === maxRows) return null;
    if (n === capacity) {
      capacity *= 2;
      xs = growFloat64(xs, capacity);
      ys = growFloat64(ys, capacity);
      lineNumbers = growInt32(lineNumbers, capacity);
    }

    // Cells of a content row, from the line's first character (a leading tab may be an empty first cell).
    let q = position;
    let cell = 0;
    let x = 0;
    let y = 0;
    for (;;) {
      code = text.charCodeAt(q);
      while (code === SPACE || (code === TAB && tabIsBlank)) code = text.charCodeAt(++q);
      if (whitespace && (q >= length || code === LF || code === CR)) break;
      if (cell >= columnCount) {
        // Only trailing empty cells may follow the last column.
        if (whitespace) return null;
        q = skipTrailingSeparators(text, q, separator, tabIsBlank);
        if (q < 0) return null;
        break;
      }
      const used = cell === xIndex || cell === yIndex;
      if (used) {
        // Decimal number: [+-] digits [mark digits] [e|E [+-] digits], as parseNumberCell reads it.
        const numberStart = q;
        let negative = false;
        if (code === MINUS || code === PLUS) {
          negative = code === MINUS;
          code = text.charCodeAt(++q);
        }
        let mantissa = 0;
        let digits = 0;
        let fractionDigits = 0;
        while (code >= 48 && code <= 57) {
          mantissa = mantissa * 10 + (code - 48);
          digits++;
          code = text.charCodeAt(++q);
        }
        if (code === decimal) {
          code = text.charCodeAt(++q);
          while (code >= 48 && code <= 57) {
            mantissa = mantissa * 10 + (code - 48);
            digits++;
            fractionDigits++;
            code = text.charCodeAt(++q);
          }
        }
        if (digits === 0) return null;
        let value: number;
        if (code === 69 || code === 101 || digits > MAX_EXACT_DIGITS) {
          if (code === 69 || code === 101) {
            code = text.charCodeAt(++q);
            if (code === PLUS || code === MINUS) code = text.charCodeAt(++q);
            while (code >= 48 && code <= 57) code = text.charCodeAt(++q);
          }
          value = parseNumberCell(text.slice(numberStart, q), decimalSeparator);
          if (Number.isNaN(value)) return null;
        } else {
          value = fractionDigits === 0 ? mantissa : mantissa / POWERS_OF_TEN[fractionDigits];
          if (negative) value = -value;
        }
        if (cell === xIndex) x = value;
        else y = value;
        // Blanks after a number are the separator itself when whitespace separates the columns.
        if (!whitespace)
          while (code === SPACE || (code === TAB && tabIsBlank)) code = text.charCodeAt(++q);
      } else {
        // An unused cell may hold anything plain; it must not be empty, quoted, or hide a line break.
        const cellStart = q;
        while (
          q < length &&
          code !== separator &&
          code !== LF &&
          !(code === CR && text.charCodeAt(q + 1) === LF) &&
          !(whitespace && (code === SPACE || code === TAB))
        ) {
          if (code === QUOTE || code > 126 || (code < SPACE && code !== TAB)) return null;
          code = text.charCodeAt(++q);
        }
        let end = q;
        while (end > cellStart && isBlank(text.charCodeAt(end - 1), tabIsBlank)) end--;
        if (end === cellStart) return null;
      }
      cell++;
      if (q >= length || code === LF) break;
      if (code === CR) {
        if (text.charCodeAt(q + 1) !== LF) return null;
        break;
      }
      if (whitespace) {
        if (code !== SPACE && code !== TAB) return null;
      } else {
        if (code !== separator) return null;
        q++;
      }
    }
    if (cell !== columnCount) return null;
    code = text.charCodeAt(q);
    if (q < length && code !== LF && !(code === CR && text.charCodeAt(q + 1) === LF)) return null;
    xs[n] = x;
    ys[n] = y;
    lineNumbers[n] = line;
    n++;
    position = q >= length ? length : q + (code === CR ? 2 : 1);
    line++;
  }
  return { x: xs.subarray(0, n), y: ys.subarray(0, n), lines: lineNumbers.subarray(0, n) };
}

function isBlank(code: number, tabIsBlank: boolean): boolean {
  return code === SPACE || (code === TAB && tabIsBlank);
}

/** The offset of the line's end after separators and blanks only, or −1 when anything else follows. */
function skipTrailingSeparators(
  text: string,
  from: number,
  separator: number,
  tabIsBlank: boolean,
): number {
  let q = from;
  let code = text.charCodeAt(q);
  while (code === separator || isBlank(code, tabIsBlank)) code = text.charCodeAt(++q);
  if (q >= text.length || code === LF || code === CR) return q;
  return -1;
}
