// Decodes the data lines of a JCAMP-DX (XY..XY) block (##XYPOINTS= or ##PEAK TABLE=): AFFN pairs
// separated by blanks, commas or semicolons, bounded by the point limit as it reads.
import { describeBadCell } from "./describe-bad-cell";
import { assertNonNegativeIntegers, assertTextSpan } from "./assert-decode-options";
import { growFloat64, growInt32 } from "./grow-typed-array";
import { parseNumberCell } from "./parse-number-cell";
import { SpectrumParseError } from "./spectrum-parse-error";
import { DEFAULT_MAX_POINTS } from "./spectrum-read-options";

export interface DecodeJcampXyPointsOptions {
  /**
   * Offset in `text` of the first data line.
   * @default 0
   */
  start?: number;
  /**
   * Offset in `text` where the data lines end (the next ## line).
   * @default text.length
   */
  end?: number;
  /**
   * 1-based file line at `start`, for error locations.
   * @default 1
   */
  firstLineNumber?: number;
  /**
   * Most points the block may hold; one more stops reading with "too-large".
   * @default 2000000
   */
  maxPoints?: number;
  /**
   * The block's NPOINTS when the file states it: one point more stops reading with "jcamp-structure".
   * @default undefined
   */
  declaredPoints?: number;
}

export interface DecodedXyPoints {
  /** X as written (XFACTOR not applied), in file order. */
  x: Float64Array;
  /** Y as written (YFACTOR not applied). */
  y: Float64Array;
  /** 1-based file line of each point. */
  lines: Int32Array;
}

const INITIAL_CAPACITY = 1024;

/** The points of the (XY..XY) lines in `text[start, end)`; a located SpectrumParseError for anything else. */
export function decodeJcampXyPoints(
  text: string,
  options: DecodeJcampXyPointsOptions = {},
): DecodedXyPoints {
  const {
    start = 0,
    end = text.length,
    firstLineNumber = 1,
    maxPoints = DEFAULT_MAX_POINTS,
    declaredPoints,
  } = options;
  if (typeof text !== "string") throw new RangeError("text must be a string");
  assertNonNegativeIntegers({ start, end, firstLineNumber, maxPoints });
  assertTextSpan(text, start, end);
  if (declaredPoints !== undefined) assertNonNegativeIntegers({ declaredPoints });

  const limit = declaredPoints === undefined ? maxPoints : Math.min(maxPoints, declaredPoints);
  let capacity = Math.min(INITIAL_CAPACITY, limit);
  let xs = new Float64Array(capacity);
  let ys = new Float64Array(capacity);
  let lines = new Int32Array(capacity);
  let count = 0;
  let lineNumber = firstLineNumber;
  let position = start;

  while (position < end) {
    const lineStart = position;
    let lineEnd = position;
    while (lineEnd < end) {
      const c = text.charCodeAt(lineEnd);
      if (c === 10 || c === 13) break;
      lineEnd++;
    }
    let dataEnd = lineStart;
    while (
      dataEnd < lineEnd &&
      !(text.charCodeAt(dataEnd) === 36 && text.charCodeAt(dataEnd + 1) === 36)
    )
      dataEnd++;

    let values = 0;
    let q = lineStart;
    for (;;) {
      while (q < dataEnd && isSeparator(text.charCodeAt(q))) q++;
      if (q >= dataEnd) break;
      const tokenStart = q;
      while (q < dataEnd && !isSeparator(text.charCodeAt(q))) q++;
      const token = text.slice(tokenStart, q);
      const value = parseNumberCell(token, ".");
      if (Number.isNaN(value))
        throw describeBadCell(token, lineNumber, tokenStart - lineStart + 1, ".");
      if (values % 2 === 0) {
        if (count >= limit) {
          throw limit < maxPoints
            ? new SpectrumParseError(
                "jcamp-structure",
                `NPOINTS says ${declaredPoints} but the block holds more points`,
                lineNumber,
                tokenStart - lineStart + 1,
              )
            : new SpectrumParseError(
                "too-large",
                `the block holds more than the limit of ${maxPoints} points`,
                lineNumber,
                tokenStart - lineStart + 1,
              );
        }
        if (count === capacity) {
          capacity = Math.min(limit, capacity * 2);
          xs = growFloat64(xs, capacity);
          ys = growFloat64(ys, capacity);
          lines = growInt32(lines, capacity);
        }
        xs[count] = value;
        lines[count] = lineNumber;
      } else {
        ys[count++] = value;
      }
      values++;
    }
    if (values % 2 !== 0) {
      throw new SpectrumParseError(
        "column-count",
        `an x without its y (${values} values on the line)`,
        lineNumber,
        null,
      );
    }
    position =
      lineEnd >= end
        ? end
        : text.charCodeAt(lineEnd) === 13 && text.charCodeAt(lineEnd + 1) === 10
          ? lineEnd + 2
          : lineEnd + 1;
    lineNumber++;
  }
  return { x: xs.slice(0, count), y: ys.slice(0, count), lines: lines.slice(0, count) };
}

/** Blanks, tabs, commas and semicolons separate values. */
function isSeparator(code: number): boolean {
  return code === 32 || code === 9 || code === 44 || code === 59;
}
