// Entry check shared by the signal and peak stages: a Float64Array of finite numbers, long enough.

/**
 * Throws a RangeError naming `name` unless `values` is a Float64Array of at least
 * `minLength` finite numbers (NaN or ±Infinity would silently poison every later stage).
 */
export function assertFiniteArray(values: Float64Array, name: string, minLength = 1): void {
  if (!(values instanceof Float64Array)) {
    throw new RangeError(`${name} must be a Float64Array`);
  }
  if (values.length < minLength) {
    throw new RangeError(`${name} must have at least ${minLength} samples (got ${values.length})`);
  }
  for (let i = 0; i < values.length; i++) {
    if (!Number.isFinite(values[i])) {
      throw new RangeError(`${name}[${i}] is not a finite number (${values[i]})`);
    }
  }
}
