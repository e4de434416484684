// Blend tests that need no second maximum: a lopsided peak (top off the half-height midpoint) or
// a top too flat for its width, each only when the difference is well above what noise can make.
import type { PeakTop } from "./fit-peak-top";

export interface ShapeSuggestsBlendOptions {
  /** Index of the top sample. */
  index: number;
  /** The three-point fit at that index. */
  top: PeakTop;
  /** Fractional index of the left half-height crossing. */
  left: number;
  /** Fractional index of the right half-height crossing. */
  right: number;
  /** Per-sample noise σ of the raw counts. */
  noise: number;
  /** Smoothing weights applied to the raw counts (a single 1 when unsmoothed). */
  smoothingWeights: Float64Array;
  /** One-sigma noise of the fitted centre, in samples (propagated by the caller). */
  centreNoise: number;
  /**
   * How many standard deviations a difference must reach to count.
   * @default 3
   */
  significance?: number;
}

/** −(ln-curvature at the top)·FWHM² of a Gaussian: 8 ln 2 ≈ 5.55 (a Lorentzian gives 8). */
const GAUSSIAN_FLATNESS = 8 * Math.LN2;
/** Below this the top is flatter than any single Gaussian or Lorentzian line (two merged lines). */
const FLAT_TOP_LIMIT = 4;
/** Below this lopsidedness (fraction of FWHM) a real line's asymmetry is not called a blend. */
const MIN_ASYMMETRY = 0.03;

/**
 * True when the peak on `signal` (continuum removed, smoothed) looks like two unresolved lines:
 * either the half-height midpoint sits off the fitted top by more than MIN_ASYMMETRY·FWHM and by
 * `significance` σ, or (Gaussian fits only) the top's log-curvature × FWHM² is under FLAT_TOP_LIMIT
 * and `significance` σ below the Gaussian value.
 */
export function shapeSuggestsBlend(
  signal: Float64Array,
  options: ShapeSuggestsBlendOptions,
): boolean {
  const {
    index,
    top,
    left,
    right,
    noise,
    smoothingWeights,
    centreNoise,
    significance = 3,
  } = options;
  if (top.method === "flat") return false;
  const smoothedNoise = noise * Math.sqrt(smoothingWeights.reduce((sum, w) => sum + w * w, 0));
  const fwhm = right - left;
  const centre = index + top.offset;

  const crossingNoise = (t: number) => {
    const i = Math.min(signal.length - 2, Math.max(0, Math.floor(t)));
    const slope = Math.abs(signal[i + 1] - signal[i]);
    return slope > 0 ? smoothedNoise / slope : Infinity;
  };
  const midpointNoise = 0.5 * Math.hypot(crossingNoise(left), crossingNoise(right));
  const offCentre = Math.abs((left + right) / 2 - centre);
  if (
    offCentre > MIN_ASYMMETRY * fwhm &&
    offCentre > significance * Math.hypot(midpointNoise, centreNoise)
  ) {
    return true;
  }

  if (top.method !== "gaussian") return false;
  const a = signal[index - 1];
  const b = signal[index];
  const c = signal[index + 1];
  const flatness = -(Math.log(a) - 2 * Math.log(b) + Math.log(c)) * fwhm * fwhm;
  // σ of a − 2b + c on the log scale, neglecting the smoothing's correlation between neighbours.
  const flatnessNoise =
    smoothedNoise * Math.sqrt(1 / (a * a) + 4 / (b * b) + 1 / (c * c)) * fwhm * fwhm;
  return flatness < FLAT_TOP_LIMIT && GAUSSIAN_FLATNESS - flatness > significance * flatnessNoise;
}
