// Entry check shared across the core and the line table: a quantity must be a finite number ≥ 0.

/** Throws a RangeError naming `name` unless `value` is finite and ≥ 0. */
export function assertNonNegativeFinite(value: number, name: string): void {
  if (!(value >= 0) || !Number.isFinite(value)) {
    throw new RangeError(`${name} must be a finite number ≥ 0, got ${value}`);
  }
}
