// Entry check shared across the core and the line table: a quantity must be a positive finite number.

/** Throws a RangeError naming `name` unless `value` is finite and > 0. */
export function assertPositiveFinite(value: number, name: string): void {
  if (typeof value !== "number" || !Number.isFinite(value) || value <= 0) {
    throw new RangeError(`${name} must be a positive finite number, got ${String(value)}`);
  }
}
