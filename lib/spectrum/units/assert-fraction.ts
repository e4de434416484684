// Entry check shared across the core: a share must lie in [0, 1].

/** Throws a RangeError naming `name` unless `value` lies in [0, 1] (NaN does not). */
export function assertFraction(value: number, name: string): void {
  if (!(value >= 0 && value <= 1)) {
    throw new RangeError(`${name} must lie in [0, 1], got ${value}`);
  }
}
