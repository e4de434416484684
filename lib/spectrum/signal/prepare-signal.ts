// The signal a peak finder (and a chart) needs: smoothed, continuum, continuum-removed, noise, clipping.
import type { SourceKind } from "../types";
import { assertFiniteArray } from "./assert-finite-array";
import { assertStrictlyIncreasing } from "./assert-strictly-increasing";
import { defaultBaselineFor } from "./default-baseline-for";
import { estimateContinuum, type BaselineOptions } from "./estimate-continuum";
import { estimateNoise } from "./estimate-noise";
import { estimateNoiseProfile, type EstimateNoiseProfileOptions } from "./estimate-noise-profile";
import { findSaturatedRanges, type IndexRange } from "./find-saturated-ranges";
import { savitzkyGolay } from "./savitzky-golay";

export interface PrepareSignalOptions {
  /**
   * Savitzky–Golay smoothing applied before everything else (per sample, so a non-uniform axis
   * is smoothed as if locally uniform), or false to use the raw counts.
   * @default { windowSize: 9, polynomial: 4 } (keeps a 3-sample-wide line's height within ~10 %)
   */
  smoothing?: { windowSize?: number; polynomial?: number } | false;
  /**
   * Continuum model. When omitted, `defaultBaselineFor(source)`.
   * @default defaultBaselineFor(source)
   */
  baseline?: BaselineOptions;
  /**
   * Kind of source, used only to pick the default baseline.
   * @default "flame"
   */
  source?: SourceKind;
  /**
   * Per-sample noise σ in counts, when the caller knows it (e.g. from dark frames); otherwise estimated.
   * @default estimateNoise(y)
   */
  noise?: number;
  /**
   * Detector full-scale count for saturation detection; see findSaturatedRanges.
   * @default undefined
   */
  detectorMax?: number;
  /**
   * Settings of the per-sample noise model σ² = a + b·continuum (see estimateNoiseProfile), or
   * false for one σ over the whole array. Not used when `noise` is given.
   * @default {} (estimateNoiseProfile's defaults)
   */
  noiseProfile?: EstimateNoiseProfileOptions | false;
}

export interface PreparedSignal {
  /** Savitzky–Golay smoothed counts (a copy of y when smoothing is off). */
  smoothed: Float64Array;
  /** Continuum under the smoothed counts. */
  continuum: Float64Array;
  /** smoothed − continuum: what peaks are measured on. */
  corrected: Float64Array;
  /** Robust per-sample noise σ of the raw counts (never 0: a noise-free input gets a tiny floor). */
  noise: number;
  /** Per-sample noise σ of the raw counts where it grows measurably with the continuum (shot
   * noise); absent when one σ describes the array (then `noise` holds everywhere). */
  noiseProfile?: Float64Array;
  /** Runs of raw samples at the detector maximum. */
  saturatedRanges: IndexRange[];
  /** The smoothing actually applied (false when none), so later stages can propagate noise through it. */
  smoothing: { windowSize: number; polynomial: number } | false;
}

/** Shortest spectrum accepted. */
export const MIN_SIGNAL_LENGTH = 16;

/** Smooths, removes the continuum and measures noise and clipping of the spectrum (x, y). */
export function prepareSignal(
  x: Float64Array,
  y: Float64Array,
  options: PrepareSignalOptions = {},
): PreparedSignal {
  assertFiniteArray(x, "x", MIN_SIGNAL_LENGTH);
  assertFiniteArray(y, "y", MIN_SIGNAL_LENGTH);
  if (x.length !== y.length)
    throw new RangeError(`x and y differ in length (${x.length} vs ${y.length})`);
  assertStrictlyIncreasing(x);
  const { source = "flame", detectorMax } = options;
  const baseline = options.baseline ?? defaultBaselineFor(source);
  const smoothing =
    options.smoothing === false
      ? false
      : {
          windowSize: options.smoothing?.windowSize ?? 9,
          polynomial: options.smoothing?.polynomial ?? 4,
        };
  if (smoothing && smoothing.windowSize > y.length) {
    throw new RangeError(
      `smoothing windowSize ${smoothing.windowSize} exceeds the ${y.length} samples`,
    );
  }

  const saturatedRanges = findSaturatedRanges(y, { detectorMax });
  const smoothed = smoothing
    ? keepClippedRaw(
        savitzkyGolay(y, { ...smoothing, derivative: 0 }),
        y,
        saturatedRanges,
        smoothing,
      )
    : Float64Array.from(y);
  const continuum = estimateContinuum(x, smoothed, baseline);
  const corrected = new Float64Array(y.length);
  for (let i = 0; i < y.length; i++) corrected[i] = smoothed[i] - continuum[i];

  let noise: number;
  if (options.noise !== undefined) {
    if (!(options.noise > 0) || !Number.isFinite(options.noise)) {
      throw new RangeError(`noise must be a positive finite number (got ${options.noise})`);
    }
    noise = options.noise;
  } else {
    noise = estimateNoise(y);
    // Synthetic or heavily processed data can have zero MAD; keep SNR finite rather than infinite.
    let scale = 0;
    for (let i = 0; i < y.length; i++) scale = Math.max(scale, Math.abs(y[i]));
    noise = Math.max(noise, 1e-12 * scale, Number.MIN_VALUE);
  }
  const profileOptions = options.noiseProfile ?? {};
  const noiseProfile =
    options.noise === undefined && profileOptions !== false
      ? estimateNoiseProfile(y, continuum, profileOptions)
      : null;
  if (noiseProfile)
    return { smoothed, continuum, corrected, noise, noiseProfile, saturatedRanges, smoothing };
  return { smoothed, continuum, corrected, noise, saturatedRanges, smoothing };
}

/**
 * A polynomial smoothing rings at the corners of a clipped (flat) top: two false tops on the
 * plateau, a dip between them deep enough to pass for two lines, and lobes of a few per cent of the
 * clip level beside it, which the peak finder took for lines (a saturated lamp line came out as two
 * peaks at one centre plus two faint neighbours). Within half a window of a clipped run the raw
 * counts stand instead: the line is strong there, so its noise matters little, and the plateau stays
 * flat.
 */
function keepClippedRaw(
  smoothed: Float64Array,
  y: Float64Array,
  clipped: readonly IndexRange[],
  smoothing: { windowSize: number },
): Float64Array {
  const half = (smoothing.windowSize - 1) >> 1;
  for (const range of clipped) {
    const from = Math.max(0, range.start - half);
    const to = Math.min(y.length - 1, range.end + half);
    for (let i = from; i <= to; i++) smoothed[i] = y[i];
  }
  return smoothed;
}
