// Growth of the typed arrays that decoders fill without knowing the final count.

/** A copy of `values` in a larger Float64Array of `capacity` elements. */
export function growFloat64(
  values: Float64Array<ArrayBuffer>,
  capacity: number,
): Float64Array<ArrayBuffer> {
  const next = new Float64Array(capacity);
  next.set(values);
  return next;
}

/** A copy of `values` in a larger Int32Array of `capacity` elements. */
export function growInt32(
  values: Int32Array<ArrayBuffer>,
  capacity: number,
): Int32Array<ArrayBuffer> {
  const next = new Int32Array(capacity);
  next.set(values);
  return next;
}
