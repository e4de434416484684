// Averages neighbouring samples of a heavily oversampled spectrum, so that peak finding sees a line
// over a handful of samples (as its smoothing window expects) instead of thousands.
import { assertFiniteArray } from "./assert-finite-array";
import { assertStrictlyIncreasing } from "./assert-strictly-increasing";

export interface BinSamplesOptions {
  /** Number of consecutive samples averaged into one; the last bin may hold fewer.
   * @default 1 (no binning) */
  factor?: number;
}

/**
 * Mean x and mean y of each run of `factor` samples. Mean x keeps every bin on the original axis,
 * so peak centres found on the binned data need no conversion; averaging y divides white noise by √factor.
 */
export function binSamples(
  x: Float64Array,
  y: Float64Array,
  options: BinSamplesOptions = {},
): { x: Float64Array; y: Float64Array } {
  const { factor = 1 } = options;
  if (!Number.isInteger(factor) || factor < 1)
    throw new RangeError(`factor must be a positive integer, got ${factor}`);
  if (x.length !== y.length)
    throw new RangeError(`x and y must have the same length (${x.length} ≠ ${y.length})`);
  assertFiniteArray(x, "x");
  assertFiniteArray(y, "y");
  assertStrictlyIncreasing(x, "x");
  if (factor === 1) return { x: x.slice(), y: y.slice() };
  const bins = Math.ceil(x.length / factor);
  const binnedX = new Float64Array(bins);
  const binnedY = new Float64Array(bins);
  for (let b = 0; b < bins; b++) {
    const start = b * factor;
    const end = Math.min(x.length, start + factor);
    let sumX = 0;
    let sumY = 0;
    for (let i = start; i < end; i++) {
      sumX += x[i];
      sumY += y[i];
    }
    binnedX[b] = sumX / (end - start);
    binnedY[b] = sumY / (end - start);
  }
  return { x: binnedX, y: binnedY };
}
