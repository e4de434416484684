// Robust per-sample noise of a spectrum: the scaled median absolute deviation of its differences.
import { assertFiniteArray } from "./assert-finite-array";
import { xMedian } from "./x-median";

export interface EstimateNoiseOptions {
  /**
   * Order of the difference taken before the MAD. The second difference cancels a sloping
   * continuum exactly and a smoothly curved one almost; the first leaves a slope's constant step,
   * which the median then removes.
   * @default 2
   */
  differenceOrder?: 1 | 2;
}

/** Φ⁻¹(3/4): the MAD of a normal distribution in units of its standard deviation. */
const MAD_OF_UNIT_NORMAL = 0.6744897501960817;

/**
 * Standard deviation σ of white noise on `y`, robust to peaks and continuum.
 *
 * For independent samples of variance σ², the second difference y[i−1] − 2y[i] + y[i+1] has
 * variance (1 + 4 + 1)σ² = 6σ² (the first difference: 2σ²) and stays normal, so its MAD is
 * 0.67449·√6·σ; dividing by that returns σ. Peaks occupy a minority of samples, so the median
 * ignores them. Returns 0 for noise-free data.
 */
export function estimateNoise(y: Float64Array, options: EstimateNoiseOptions = {}): number {
  const { differenceOrder = 2 } = options;
  if (differenceOrder !== 1 && differenceOrder !== 2) {
    throw new RangeError(`differenceOrder must be 1 or 2 (got ${String(differenceOrder)})`);
  }
  assertFiniteArray(y, "y", differenceOrder + 1);
  const n = y.length - differenceOrder;
  const differences = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    differences[i] = differenceOrder === 2 ? y[i] - 2 * y[i + 1] + y[i + 2] : y[i + 1] - y[i];
  }
  const centre = xMedian(differences);
  for (let i = 0; i < n; i++) differences[i] = Math.abs(differences[i] - centre);
  const mad = xMedian(differences);
  const varianceFactor = differenceOrder === 2 ? 6 : 2;
  return mad / (MAD_OF_UNIT_NORMAL * Math.sqrt(varianceFactor));
}
