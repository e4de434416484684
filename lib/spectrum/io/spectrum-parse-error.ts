// The one error a spectrum reader throws for bad input: a code to branch on, and where in the file it is.

/** What is wrong with the input. */
export type SpectrumParseErrorCode =
  /** Nothing to read: no data rows at all. */
  | "empty"
  /** A cell that is not a number. */
  | "non-numeric"
  /** A cell left empty between separators. */
  | "empty-cell"
  /** NaN, Infinity or a number too large for a double. */
  | "not-finite"
  /** Fewer data points than the stated minimum. */
  | "too-few-points"
  /** Two rows with the same x. */
  | "duplicate-x"
  /** x that turns back (neither strictly increasing nor strictly decreasing). */
  | "non-monotonic-x"
  /** A row whose number of columns differs from the first data row, or too few columns. */
  | "column-count"
  /** Text over the byte limit, or more data rows than the point limit. */
  | "too-large"
  /** The unit of the first column is neither in the file nor stated by the caller, or is not spectral. */
  | "unit-unknown"
  /** The file's unit or medium contradicts the one the caller stated. */
  | "unit-conflict"
  /** Binary content (NUL bytes) where text was expected. */
  | "binary"
  /** A JCAMP-DX file whose structure is broken (no data block, wrong NPOINTS, …). */
  | "jcamp-structure"
  /** A value outside what it can physically be: a zero or absurd scale factor, a negative wavelength, … */
  | "out-of-range";

/** A file that cannot be read as a spectrum, with the 1-based line and column where known. */
export class SpectrumParseError extends Error {
  readonly code: SpectrumParseErrorCode;
  /** 1-based line in the file, or null when the problem is the file as a whole. */
  readonly line: number | null;
  /** 1-based column (a cell for text files, a character for JCAMP-DX data lines), or null. */
  readonly column: number | null;
  /**
   * For "unit-conflict": which of the caller's statements the file contradicts, so that a caller can
   * point at its own field; undefined for every other error.
   */
  readonly stated: "xUnit" | "medium" | undefined;

  constructor(
    code: SpectrumParseErrorCode,
    problem: string,
    line: number | null = null,
    column: number | null = null,
    stated?: "xUnit" | "medium",
  ) {
    super(`${locationPrefix(line, column)}${problem}`);
    this.name = "SpectrumParseError";
    this.code = code;
    this.line = line;
    this.column = column;
    this.stated = stated;
  }
}

function locationPrefix(line: number | null, column: number | null): string {
  if (line === null) return "";
  return column === null ? `Line ${line}: ` : `Line ${line}, column ${column}: `;
}
