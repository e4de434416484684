// Entry check for integer options (window sizes, degrees, iteration counts) so bad values fail loudly and early.

/** Throws a RangeError unless `value` is an integer with `min ≤ value ≤ max`. */
export function assertIntegerInRange(
  value: number,
  name: string,
  min: number,
  max = Number.MAX_SAFE_INTEGER,
): void {
  if (!Number.isInteger(value) || value < min || value > max) {
    const upper = max === Number.MAX_SAFE_INTEGER ? "" : ` and at most ${max}`;
    throw new RangeError(`${name} must be an integer of at least ${min}${upper} (got ${value})`);
  }
}
