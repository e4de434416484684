// Entry check for abscissae: peak centres and widths are interpolated on x, which only makes sense if x rises.

/** Throws a RangeError at the first index where `x` does not strictly increase. */
export function assertStrictlyIncreasing(x: Float64Array, name = "x"): void {
  for (let i = 1; i < x.length; i++) {
    if (!(x[i] > x[i - 1])) {
      throw new RangeError(
        `${name} must be strictly increasing: ${name}[${i - 1}] = ${x[i - 1]}, ${name}[${i}] = ${x[i]} (sort descending files first)`,
      );
    }
  }
}
