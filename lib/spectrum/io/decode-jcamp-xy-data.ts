// Decodes the data lines of a JCAMP-DX ##XYDATA=(X++(Y..Y)) block in every ASDF form (AFFN, PAC, SQZ, DIF,
// DUP), bounded while it expands: a DUP count or a value that would pass the point limit stops decoding
// before anything is stored, so a few bytes cannot ask for gigabytes (a 164-byte file once did).
import { SpectrumParseError } from "./spectrum-parse-error";
import { assertNonNegativeIntegers, assertTextSpan } from "./assert-decode-options";
import { DEFAULT_MAX_POINTS } from "./spectrum-read-options";

export interface DecodeJcampXyDataOptions {
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
   * Most Y values the block may decode to; one more stops decoding with "too-large".
   * @default 2000000
   */
  maxPoints?: number;
  /**
   * The block's NPOINTS when the file states it: one value more stops decoding with "jcamp-structure".
   * @default undefined (only maxPoints bounds the block)
   */
  declaredPoints?: number;
  /**
   * Largest DUP count accepted, whatever room is left under the point limits.
   * @default maxPoints
   */
  maxDupCount?: number;
  /**
   * Most work units (one per character read, one per value a DUP count adds) before decoding gives up with
   * "too-large". Characters and values are each bounded already; this is the bound on both together.
   * @default 100000000
   */
  maxWorkUnits?: number;
  /**
   * Called with each data line's X when the line is reached; may throw to stop decoding.
   * @default undefined
   */
  onLine?: XyDataLineListener;
  /**
   * An object whose `units` the decoder increases by the work it did, also when it throws: lets a
   * caller (or a test) see that a refused file was refused early.
   * @default undefined
   */
  workMeter?: { units: number };
}

export interface DecodedXyData {
  /** The Y values as written (YFACTOR not applied), in file order, Y check values dropped. */
  y: Float64Array;
  /** Number of data lines (blank and comment-only lines not counted). */
  lineCount: number;
}

/**
 * Told of each data line as it is read, so that a caller can check its X without the decoder keeping a
 * table of lines (a file of one value a line would make that table larger than the values).
 * @param lineNumber 1-based file line
 * @param x the line's X value as written (XFACTOR not applied)
 * @param pointIndex index in y of the ordinate the X belongs to (in DIF form, the Y check's)
 * @param firstValueIndex index in y of the first value the line adds (y.length when it adds none)
 */
export type XyDataLineListener = (
  lineNumber: number,
  x: number,
  pointIndex: number,
  firstValueIndex: number,
) => void;

/** Default for maxWorkUnits: far above a 64 MiB file of 2,000,000 points, far below a stalled server. */
const DEFAULT_MAX_WORK_UNITS = 100_000_000;

const ABSOLUTE = 1; // AFFN, PAC or SQZ: a value
const DIFFERENCE = 2; // DIF: a difference from the previous value
const DUPLICATE = 3; // DUP: a repeat count
const INITIAL_CAPACITY = 1024;
/** Mantissas of up to 15 digits are exact doubles, so they are built without a string. */
const MAX_EXACT_DIGITS = 15;

/**
 * The Y values of the XYDATA lines in `text[start, end)`, and each line's X check value. In DIF form the
 * first Y of a line repeats the last Y of the line before (JCAMP-DX 4.24's Y check value): it is compared
 * and dropped. Throws a located SpectrumParseError for any character, form or count it cannot take.
 */
export function decodeJcampXyData(
  text: string,
  options: DecodeJcampXyDataOptions = {},
): DecodedXyData {
  const {
    start = 0,
    end = text.length,
    firstLineNumber = 1,
    maxPoints = DEFAULT_MAX_POINTS,
    declaredPoints,
    maxWorkUnits = DEFAULT_MAX_WORK_UNITS,
    workMeter,
    onLine,
  } = options;
  const { maxDupCount = maxPoints } = options;
  if (typeof text !== "string") throw new RangeError("text must be a string");
  assertNonNegativeIntegers({ start, end, firstLineNumber, maxPoints, maxDupCount, maxWorkUnits });
  assertTextSpan(text, start, end);
  if (declaredPoints !== undefined) assertNonNegativeIntegers({ declaredPoints });

  const limit = declaredPoints === undefined ? maxPoints : Math.min(maxPoints, declaredPoints);
  let y = new Float64Array(Math.min(INITIAL_CAPACITY, limit));
  let count = 0;
  let lineCount = 0;
  const token: Token = { kind: 0, value: 0, end: 0, problem: "", refusal: "non-numeric" };
  let work = 0;
  let lineNumber = firstLineNumber;
  let lineStart = start;

  // Errors are built by plain functions: closures over the loop's variables would slow every value.
  const limitProblem =
    limit < maxPoints
      ? `NPOINTS says ${declaredPoints} but the XYDATA block holds more values`
      : `the XYDATA block holds more than the limit of ${maxPoints} points`;
  const limitCode = limit < maxPoints ? "jcamp-structure" : "too-large";

  try {
    /** Whether the last Y of the previous data line was in DIF form (then this line opens with a Y check). */
    let endedInDif = false;
    let position = start;
    while (position < end) {
      lineStart = position;
      let lineEnd = position;
      while (lineEnd < end) {
        const c = text.charCodeAt(lineEnd);
        if (c === 10 || c === 13) break;
        lineEnd++;
      }
      const next =
        lineEnd >= end
          ? end
          : text.charCodeAt(lineEnd) === 13 && text.charCodeAt(lineEnd + 1) === 10
            ? lineEnd + 2
            : lineEnd + 1;
      // "$$" starts a comment; searched within the line only.
      let dataEnd = lineStart;
      while (
        dataEnd < lineEnd &&
        !(text.charCodeAt(dataEnd) === 36 && text.charCodeAt(dataEnd + 1) === 36)
      )
        dataEnd++;
      work += next - lineStart;
      if (work > maxWorkUnits) throw overWork(maxWorkUnits, lineNumber);

      let q = skipSeparators(text, lineStart, dataEnd);
      if (q < dataEnd) {
        if (!readToken(text, q, dataEnd, token)) {
          throw located(token.refusal, token.problem, lineNumber, lineStart, q);
        }
        if (token.kind !== ABSOLUTE) {
          throw located(
            "jcamp-structure",
            "a data line must open with its X value, not a DIF or DUP character",
            lineNumber,
            lineStart,
            q,
          );
        }
        let checkPending = endedInDif;
        lineCount++;
        if (onLine) onLine(lineNumber, token.value, checkPending ? count - 1 : count, count);
        // What a DUP would repeat: the last value or the last difference, and whether a DUP just came.
        let previousKind = 0;
        let previousValue = 0;
        let lastYKind = 0;
        q = skipSeparators(text, token.end, dataEnd);
        while (q < dataEnd) {
          if (!readToken(text, q, dataEnd, token)) {
            throw located(token.refusal, token.problem, lineNumber, lineStart, q);
          }
          const value = token.value;
          if (token.kind === ABSOLUTE) {
            if (checkPending) {
              const last = y[count - 1];
              if (Math.abs(value - last) > 1e-9 * Math.max(1, Math.abs(value), Math.abs(last))) {
                throw located(
                  "jcamp-structure",
                  `the Y check value ${value} differs from the last Y of the line before (${last})`,
                  lineNumber,
                  lineStart,
                  q,
                );
              }
              checkPending = false;
            } else {
              if (count >= limit) throw located(limitCode, limitProblem, lineNumber, lineStart, q);
              if (count === y.length) y = grown(y, count, count + 1, limit);
              y[count++] = value;
            }
            previousKind = ABSOLUTE;
            previousValue = value;
            lastYKind = ABSOLUTE;
          } else if (token.kind === DIFFERENCE) {
            if (checkPending) {
              throw located(
                "jcamp-structure",
                "the line before ends in DIF form, so this line must repeat its last Y (the Y check value) first",
                lineNumber,
                lineStart,
                q,
              );
            }
            if (count === 0)
              throw located(
                "jcamp-structure",
                "a DIF value needs a Y value before it",
                lineNumber,
                lineStart,
                q,
              );
            if (count >= limit) throw located(limitCode, limitProblem, lineNumber, lineStart, q);
            const sum = differenceSum(y[count - 1], value, lineNumber, lineStart, q);
            if (count === y.length) y = grown(y, count, count + 1, limit);
            y[count++] = sum;
            previousKind = DIFFERENCE;
            previousValue = value;
            lastYKind = DIFFERENCE;
          } else {
            if (previousKind === 0)
              throw located(
                "jcamp-structure",
                "a DUP count must follow a Y value",
                lineNumber,
                lineStart,
                q,
              );
            if (previousKind === DUPLICATE)
              throw located(
                "jcamp-structure",
                "a DUP count cannot follow another DUP count",
                lineNumber,
                lineStart,
                q,
              );
            if (value > maxDupCount) {
              const shown = value >= 1e16 ? "over 10^16" : String(value);
              throw located(
                "too-large",
                `a DUP count of ${shown} is more than the limit of ${maxDupCount}`,
                lineNumber,
                lineStart,
                q,
              );
            }
            // The DUP count includes the value already written.
            const extra = value - 1;
            if (count + extra > limit)
              throw located(limitCode, limitProblem, lineNumber, lineStart, q);
            work += extra;
            if (work > maxWorkUnits) throw overWork(maxWorkUnits, lineNumber);
            if (count + extra > y.length) y = grown(y, count, count + extra, limit);
            if (previousKind === ABSOLUTE) {
              y.fill(previousValue, count, count + extra);
              count += extra;
            } else {
              for (let k = 0; k < extra; k++) {
                y[count] = differenceSum(y[count - 1], previousValue, lineNumber, lineStart, q);
                count++;
              }
            }
            previousKind = DUPLICATE;
          }
          q = skipSeparators(text, token.end, dataEnd);
        }
        if (lastYKind === 0) {
          throw new SpectrumParseError(
            "jcamp-structure",
            "an X value without any Y value",
            lineNumber,
            null,
          );
        }
        endedInDif = lastYKind === DIFFERENCE;
      }
      position = next === lineStart ? end : next;
      lineNumber++;
    }
  } finally {
    if (workMeter) workMeter.units += work;
  }
  return { y: y.slice(0, count), lineCount };
}

interface Token {
  /** ABSOLUTE, DIFFERENCE or DUPLICATE. */
  kind: number;
  /** The value, the difference, or the DUP count. */
  value: number;
  /** Offset just past the token. */
  end: number;
  /** Why the token was refused. */
  problem: string;
  /** The error code of a refusal. */
  refusal: "non-numeric" | "not-finite";
}

/**
 * Reads the token at `at` (not a separator) into `token`; false when it is not one, with the reason.
 * A plain function over a reused object, so the hot loop allocates nothing per value.
 */
function readToken(text: string, at: number, lineEnd: number, token: Token): boolean {
  const code = text.charCodeAt(at);
  let sign = 1;
  let lead = 0;
  let kind: number;
  // AFFN and PAC are written as they stand; SQZ and DIF carry their sign and first digit in a letter.
  let letter = true;
  if (code >= 48 && code <= 57) {
    kind = ABSOLUTE;
    lead = code - 48;
    letter = false;
  } else if (code === 43 || code === 45 || code === 46) {
    kind = ABSOLUTE; // AFFN or PAC: an optional sign, then digits with at most one decimal point
    if (code === 45) sign = -1;
    letter = false;
  } else if (code === 64) {
    kind = ABSOLUTE; // SQZ "@" is +0
  } else if (code >= 65 && code <= 73) {
    kind = ABSOLUTE; // SQZ A–I: +1 to +9
    lead = code - 64;
  } else if (code >= 97 && code <= 105) {
    kind = ABSOLUTE; // SQZ a–i: −1 to −9
    lead = code - 96;
    sign = -1;
  } else if (code === 37) {
    kind = DIFFERENCE; // DIF "%" is 0
  } else if (code >= 74 && code <= 82) {
    kind = DIFFERENCE; // DIF J–R: +1 to +9
    lead = code - 73;
  } else if (code >= 106 && code <= 114) {
    kind = DIFFERENCE; // DIF j–r: −1 to −9
    lead = code - 105;
    sign = -1;
  } else if (code >= 83 && code <= 90) {
    kind = DUPLICATE; // DUP S–Z: 1 to 8
    lead = code - 82;
  } else if (code === 115) {
    kind = DUPLICATE; // DUP s: 9
    lead = 9;
  } else {
    token.refusal = "non-numeric";
    token.problem = `"${text[at]}" cannot appear in XYDATA`;
    return false;
  }

  const signed = code === 43 || code === 45 || code === 46;
  let q = code === 46 ? at : at + 1;
  let digits = signed ? 0 : 1;
  let points = 0;
  let mantissa = lead;
  for (; q < lineEnd; q++) {
    const c = text.charCodeAt(q);
    if (c >= 48 && c <= 57) {
      digits++;
      // Capped: a DUP count past the limit is refused by the caller, a long value goes through Number().
      if (mantissa < 1e16) mantissa = mantissa * 10 + (c - 48);
    } else if (c === 46) points++;
    else break;
  }
  token.end = q;
  token.kind = kind;
  if (kind === DUPLICATE) {
    if (points > 0) {
      token.refusal = "non-numeric";
      token.problem = "a DUP count must be a whole number";
      return false;
    }
    token.value = mantissa;
    return true;
  }
  if (digits === 0 || points > 1) {
    token.refusal = "non-numeric";
    token.problem = `"${text.slice(at, q)}" is not a number`;
    return false;
  }
  let value: number;
  if (points === 0 && digits <= MAX_EXACT_DIGITS) value = sign * mantissa;
  else if (letter) value = Number(`${sign < 0 ? "-" : ""}${lead}${text.slice(at + 1, q)}`);
  else value = Number(text.slice(at, q));
  if (!Number.isFinite(value)) {
    const shown = q - at > 40 ? `${text.slice(at, at + 40)}…` : text.slice(at, q);
    token.refusal = "not-finite";
    token.problem = `"${shown}" is too large to be a finite number`;
    return false;
  }
  token.value = value;
  return true;
}

function located(
  code: "non-numeric" | "jcamp-structure" | "not-finite" | "too-large",
  problem: string,
  lineNumber: number,
  lineStart: number,
  at: number,
): SpectrumParseError {
  return new SpectrumParseError(code, problem, lineNumber, at - lineStart + 1);
}

/** `previous + difference`, the next Y of a DIF run; a located error when it is no longer finite. */
function differenceSum(
  previous: number,
  difference: number,
  lineNumber: number,
  lineStart: number,
  at: number,
): number {
  const sum = previous + difference;
  if (!Number.isFinite(sum)) {
    throw located(
      "not-finite",
      "the differences add up past the largest number",
      lineNumber,
      lineStart,
      at,
    );
  }
  return sum;
}

/** A copy of the first `count` values of `y` in an array with room for `needed`, doubling up to `limit`. */
function grown(
  y: Float64Array<ArrayBuffer>,
  count: number,
  needed: number,
  limit: number,
): Float64Array<ArrayBuffer> {
  const next = new Float64Array(Math.min(limit, Math.max(needed, y.length * 2)));
  next.set(y.subarray(0, count));
  return next;
}

function overWork(maxWorkUnits: number, line: number): SpectrumParseError {
  return new SpectrumParseError(
    "too-large",
    `the XYDATA block takes more than ${maxWorkUnits} units of work to decode`,
    line,
    null,
  );
}

/** Blanks, tabs, commas and semicolons separate values. */
function skipSeparators(text: string, from: number, to: number): number {
  let q = from;
  while (q < to) {
    const c = text.charCodeAt(q);
    if (c !== 32 && c !== 9 && c !== 44 && c !== 59) break;
    q++;
  }
  return q;
}
