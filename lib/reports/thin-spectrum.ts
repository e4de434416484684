// Thins a spectrum for drawing: beyond a budget each bucket keeps its lowest and highest point, in
// order, so every maximum (every emission line) survives at the scale of a printed page.

export interface ThinSpectrumOptions {
  /**
   * Most points returned (two per bucket).
   * @default 4000
   */
  maxPoints?: number;
}

export function thinSpectrum(
  x: Float64Array,
  y: Float64Array,
  options: ThinSpectrumOptions = {},
): { x: Float64Array; y: Float64Array } {
  const { maxPoints = 4000 } = options;
  if (x.length !== y.length) throw new RangeError(`x has ${x.length} values but y has ${y.length}`);
  if (!Number.isInteger(maxPoints) || maxPoints < 2)
    throw new RangeError(`maxPoints must be an integer ≥ 2, got ${maxPoints}`);
  if (x.length <= maxPoints) return { x: x.slice(), y: y.slice() };
  const bucket = Math.ceil((2 * x.length) / maxPoints);
  const outX: number[] = [];
  const outY: number[] = [];
  for (let start = 0; start < x.length; start += bucket) {
    const end = Math.min(x.length, start + bucket);
    let lo = start;
    let hi = start;
    for (let i = start; i < end; i++) {
      if (y[i] < y[lo]) lo = i;
      if (y[i] > y[hi]) hi = i;
    }
    for (const i of lo === hi ? [lo] : lo < hi ? [lo, hi] : [hi, lo]) {
      outX.push(x[i]);
      outY.push(y[i]);
    }
  }
  return { x: Float64Array.from(outX), y: Float64Array.from(outY) };
}
