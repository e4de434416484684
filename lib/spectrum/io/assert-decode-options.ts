// Checks the decoders share on their options: counts and offsets are non-negative integers, and a
// slice of the text lies inside it.

/** Throws a RangeError naming the first value that is not a non-negative integer. */
export function assertNonNegativeIntegers(values: Record<string, unknown>): void {
  for (const [name, value] of Object.entries(values)) {
    if (!(typeof value === "number" && Number.isInteger(value) && value >= 0)) {
      throw new RangeError(`${name} must be a non-negative integer, got ${String(value)}`);
    }
  }
}

/** Throws a RangeError unless 0 ≤ start ≤ end ≤ text.length. */
export function assertTextSpan(text: string, start: number, end: number): void {
  if (end > text.length || start > end) {
    throw new RangeError(`start ${start} and end ${end} must lie within the text, in order`);
  }
}
