// Peak measurement on a prepared signal: candidates → SNR cut → centre, FWHM, area, uncertainty → flags.
import type { Peak } from "../types";
import type { PreparedSignal } from "../signal/prepare-signal";
import { savitzkyGolay } from "../signal/savitzky-golay";
import { savitzkyGolayCoefficients } from "../signal/savitzky-golay-coefficients";
import { countCurvatureMinima } from "./count-curvature-minima";
import { dropSmoothingRinging } from "./drop-smoothing-ringing";
import { findCandidateMaxima } from "./find-candidate-maxima";
import { fitPeakTop } from "./fit-peak-top";
import { gaussianCentreBound } from "./gaussian-centre-bound";
import { halfHeightCrossings } from "./half-height-crossings";
import { shapeSuggestsBlend } from "./shape-suggests-blend";
import { xAtIndex } from "./x-at-index";

/** A top below this share of a neighbour within the smoothing window is the filter's ringing (it
 * measures 0.4 % beside a line 3 samples wide under the default 9-sample quartic). */
const RINGING_FRACTION = 0.02;

/** Floor of a centre's uncertainty, in samples (far below any real noise-limited value). */
const MIN_CENTRE_UNCERTAINTY_SAMPLES = 1e-4;

export interface PickPeaksOptions {
  /**
   * Smallest accepted height over the noise σ.
   * @default 5
   */
  minSnr?: number;
  /**
   * Two tops stay separate peaks only if the signal dips between them by this many σ below the
   * lower top; shallower dips are merged (and show up as a shoulder, hence blended).
   * @default 3
   */
  minDipSnr?: number;
  /**
   * Neighbouring peaks closer than this many FWHM (the mean of the two) are both flagged blended.
   * @default 1
   */
  blendSeparationFwhm?: number;
  /**
   * The area is integrated over the centre ± this many FWHM (never past the valleys to neighbours);
   * 1.5 FWHM holds 99.96 % of a Gaussian's area and 80 % of a Lorentzian's.
   * @default 1.5
   */
  areaHalfWidthFwhm?: number;
  /**
   * A second negative minimum of the curvature under one peak counts as a shoulder when it is this
   * many times the curvature's own noise deep (and as far from the first).
   * @default 5
   */
  shoulderSnr?: number;
}

/**
 * Finds and measures the peaks of a prepared signal (see prepareSignal) on axis `x`.
 * All searching happens per sample; results are mapped to x at the end, so a non-uniform axis is fine.
 *
 * - centre: parabola through the logs of the three top samples of the continuum-removed,
 *   smoothed signal (parabolic when one is ≤ 0); for a saturated peak, the midpoint of its
 *   half-height crossings (the clipped top carries no position);
 * - xUncertainty: the larger of (a) first-order propagation of the raw-sample noise σ through
 *   the Savitzky–Golay weights and the three-point formula, and (b) the Cramér–Rao bound for a
 *   Gaussian, 0.69·√(FWHM·Δx)/SNR (see gaussianCentreBound); for a saturated peak (a) is the
 *   noise of the half-height midpoint instead. Shot noise at the top is not included, and a
 *   saturated peak's centre assumes a symmetric line.
 * - noise σ: the prepared signal's noiseProfile at the top when it has one (shot noise grows with
 *   the continuum under the peak), else its one global noise; the detection floor (minSnr·σ), the
 *   dip test, the SNR and the centre uncertainty all use that local σ;
 * - height: vertex of that parabola (a lower bound when saturated); snr = height / σ;
 * - fwhm: between the half-height crossings; twice the one available half-width when a flank is
 *   cut by a neighbour or the array's edge;
 * - blended: a flank cut by a neighbour before half height, a neighbour within
 *   blendSeparationFwhm mean FWHMs, two significant curvature minima, or a lopsided or flat top
 *   (see shapeSuggestsBlend);
 * - area: trapezoid integral over centre ± areaHalfWidthFwhm·FWHM.
 */
export function pickPeaks(
  x: Float64Array,
  signal: PreparedSignal,
  options: PickPeaksOptions = {},
): Peak[] {
  const {
    minSnr = 5,
    minDipSnr = 3,
    blendSeparationFwhm = 1,
    areaHalfWidthFwhm = 1.5,
    shoulderSnr = 5,
  } = options;
  for (const [name, value] of Object.entries({
    minSnr,
    minDipSnr,
    blendSeparationFwhm,
    areaHalfWidthFwhm,
    shoulderSnr,
  })) {
    if (!(value >= 0) || !Number.isFinite(value))
      throw new RangeError(`${name} must be a non-negative number (got ${value})`);
  }
  const { corrected: s, noise, noiseProfile, saturatedRanges, smoothing } = signal;
  const n = s.length;
  if (x.length !== n)
    throw new RangeError(`x and the prepared signal differ in length (${x.length} vs ${n})`);
  if (noiseProfile && noiseProfile.length !== n) {
    throw new RangeError(
      `noiseProfile and the prepared signal differ in length (${noiseProfile.length} vs ${n})`,
    );
  }
  const noiseAt = (i: number) => (noiseProfile ? noiseProfile[i] : noise);

  const curvatureWindow = largestOddWindow(
    Math.max(11, (smoothing ? smoothing.windowSize : 5) + 4),
    n,
  );
  // Tops are where the smoothed signal's central differences turn, or its own one-sample local
  // maxima (a companion on a strong line's flank, where the differences never turn): a slope fitted
  // over several samples is dragged by a strong neighbour's flank and never turns on a line 2–3
  // samples wide a few widths away. Noise wiggles are merged by the dip test, not by this slope.
  const slope = new Float64Array(n);
  for (let i = 1; i < n - 1; i++) slope[i] = s[i + 1] - s[i - 1];
  const curvature = savitzkyGolay(s, { windowSize: curvatureWindow, polynomial: 2, derivative: 2 });
  const curvatureWeights = savitzkyGolayCoefficients({
    windowSize: curvatureWindow,
    polynomial: 2,
    derivative: 2,
  });
  // Curvature noise per unit raw σ: through the curvature weights (the prior smoothing only lowers it further).
  const curvatureGain = Math.sqrt(curvatureWeights.reduce((sum, w) => sum + w * w, 0));
  const smoothingWeights = smoothing
    ? savitzkyGolayCoefficients({
        windowSize: smoothing.windowSize,
        polynomial: smoothing.polynomial,
      })
    : Float64Array.of(1);

  const candidates = findCandidateMaxima(
    { signal: s, slope },
    noiseProfile
      ? {
          minHeight: noiseProfile.map((v) => minSnr * v),
          minDip: noiseProfile.map((v) => minDipSnr * v),
        }
      : { minHeight: minSnr * noise, minDip: minDipSnr * noise },
  );
  const { tops, valleys } = smoothing
    ? dropSmoothingRinging(candidates, s, {
        reach: smoothing.windowSize,
        fraction: RINGING_FRACTION,
      })
    : candidates;

  const peaks: Peak[] = [];
  const spans: number[] = [];
  let rangeCursor = 0;
  for (let p = 0; p < tops.length; p++) {
    const k = tops[p];
    // The noise at the top: with a profile, the shot noise of the continuum the peak stands on.
    const localNoise = noiseAt(k);
    const leftLimit = p > 0 ? valleys[p - 1] : 0;
    const rightLimit = p < tops.length - 1 ? valleys[p] : n - 1;
    const top = fitPeakTop(s, { index: k });
    let centre = k + top.offset;
    let height = top.height;
    const { left, right } = halfHeightCrossings(s, {
      index: k,
      level: height / 2,
      leftLimit,
      rightLimit,
    });

    const spanStart = Math.floor(left ?? k - 1);
    const spanEnd = Math.ceil(right ?? k + 1);
    while (rangeCursor < saturatedRanges.length && saturatedRanges[rangeCursor].end < spanStart)
      rangeCursor++;
    const clipped =
      rangeCursor < saturatedRanges.length && saturatedRanges[rangeCursor].start <= spanEnd
        ? saturatedRanges[rangeCursor]
        : null;
    if (clipped) {
      centre =
        left !== null && right !== null ? (left + right) / 2 : (clipped.start + clipped.end) / 2;
      // The smoothing rings at the corners of a clipped top; its middle holds the clip level.
      height = Math.min(height, s[Math.round((clipped.start + clipped.end) / 2)]);
    }

    const centreNoiseSamples = clipped
      ? crossingMidpointNoise(s, left, right, localNoise, smoothingWeights)
      : propagatedCentreNoise(top.gradient, smoothingWeights, localNoise);
    const xCentre = xAtIndex(x, centre);
    let fwhm: number;
    let fwhmSamples: number;
    if (left !== null && right !== null) {
      fwhm = xAtIndex(x, right) - xAtIndex(x, left);
      fwhmSamples = right - left;
    } else if (left !== null || right !== null) {
      const side = (left ?? right) as number;
      fwhm = 2 * Math.abs(xCentre - xAtIndex(x, side));
      fwhmSamples = 2 * Math.abs(centre - side);
    } else {
      fwhm = x[rightLimit] - x[leftLimit];
      fwhmSamples = rightLimit - leftLimit;
    }
    // A width is positive by definition. A fitted top more than twice the top sample (a one-sample
    // spike, a flat or clipped top, a top on a negative baseline) can put an interpolated crossing on
    // the wrong side of the top and make the difference zero or negative; such a peak is no wider than
    // the sampling can tell, so it gets one sample's width.
    if (!(fwhmSamples > 0) || !(fwhm > 0) || !Number.isFinite(fwhm)) {
      fwhmSamples = 1;
      fwhm = Math.max(Math.abs(xAtIndex(x, k + 0.5) - xAtIndex(x, k - 0.5)), Number.MIN_VALUE);
    }
    // A flank that stops at a neighbour's valley before half height is shared with that neighbour.
    let blended = (left === null && leftLimit > 0) || (right === null && rightLimit < n - 1);

    const areaStart = Math.max(leftLimit, Math.floor(centre - areaHalfWidthFwhm * fwhmSamples));
    const areaEnd = Math.min(rightLimit, Math.ceil(centre + areaHalfWidthFwhm * fwhmSamples));
    let area = 0;
    for (let i = areaStart; i < areaEnd; i++) area += 0.5 * (s[i] + s[i + 1]) * (x[i + 1] - x[i]);

    if (
      !clipped &&
      left !== null &&
      right !== null &&
      shapeSuggestsBlend(s, {
        index: k,
        top,
        left,
        right,
        noise: localNoise,
        smoothingWeights,
        centreNoise: centreNoiseSamples,
      })
    ) {
      blended = true;
    }
    // A shoulder must also stand above the smoothing's ringing, a few parts in a thousand of the top.
    const shoulderThreshold = Math.max(
      shoulderSnr * curvatureGain * localNoise,
      smoothing ? RINGING_FRACTION * Math.abs(curvature[k]) : 0,
    );
    if (
      !clipped &&
      countCurvatureMinima(curvature, {
        start: areaStart,
        end: areaEnd,
        threshold: shoulderThreshold,
      }) >= 2
    ) {
      blended = true;
    }

    const spacing = 0.5 * (x[k + 1] - x[k - 1]);
    const snr = height / localNoise;
    let xUncertainty = Math.max(
      centreNoiseSamples * spacing,
      gaussianCentreBound({ fwhm, spacing, snr }),
    );
    if (!Number.isFinite(xUncertainty)) xUncertainty = fwhm;
    // A (nearly) noise-free peak still has a centre known only to the sampling's numerical precision;
    // a zero uncertainty would make every later tolerance zero.
    xUncertainty = Math.max(xUncertainty, MIN_CENTRE_UNCERTAINTY_SAMPLES * spacing);

    peaks.push({
      index: Math.min(n - 1, Math.max(0, Math.round(centre))),
      x: Math.min(x[n - 1], Math.max(x[0], xCentre)),
      xUncertainty,
      height,
      fwhm,
      area,
      snr,
      saturated: clipped !== null,
      blended,
      fwhmSamples,
      ...asymmetryOf(x, left, right, xCentre, clipped === null),
    });
    spans.push(fwhm);
  }

  // Two profiles overlap at half height when their centres are closer than the mean of their FWHMs
  // (the wider alone would let a broad hump flag every line on its wings).
  for (let p = 1; p < peaks.length; p++) {
    const meanWidth = 0.5 * (spans[p - 1] + spans[p]);
    if (peaks[p].x - peaks[p - 1].x < blendSeparationFwhm * meanWidth) {
      peaks[p - 1].blended = true;
      peaks[p].blended = true;
    }
  }
  return peaks.sort((a, b) => a.x - b.x);
}

/** The peak's lean from its half-height crossings, when both flanks reach half height unclipped. */
function asymmetryOf(
  x: Float64Array,
  left: number | null,
  right: number | null,
  centre: number,
  unclipped: boolean,
): { asymmetry?: number } {
  if (!unclipped || left === null || right === null) return {};
  const [low, high] = [xAtIndex(x, left), xAtIndex(x, right)].sort((a, b) => a - b);
  const below = centre - low;
  const above = high - centre;
  if (!(below > 0) || !(above > 0)) return {};
  return { asymmetry: (above - below) / (above + below) };
}

/** σ of the three-point centre, in samples: Σ over raw samples of (Σ_m gradient_m · weight)², times σ². */
function propagatedCentreNoise(
  gradient: [number, number, number],
  weights: Float64Array,
  noise: number,
): number {
  const w = weights.length;
  const combined = new Float64Array(w + 2);
  for (let m = 0; m < 3; m++) {
    for (let j = 0; j < w; j++) combined[m + j] += gradient[m] * weights[j];
  }
  let sum = 0;
  for (let j = 0; j < combined.length; j++) sum += combined[j] * combined[j];
  return noise * Math.sqrt(sum);
}

/** σ of the half-height midpoint, in samples: smoothed noise over the flank slope at each crossing. */
function crossingMidpointNoise(
  s: Float64Array,
  left: number | null,
  right: number | null,
  noise: number,
  weights: Float64Array,
): number {
  const smoothedNoise = noise * Math.sqrt(weights.reduce((sum, w) => sum + w * w, 0));
  const one = (t: number | null) => {
    if (t === null) return Infinity;
    const i = Math.min(s.length - 2, Math.max(0, Math.floor(t)));
    const slope = Math.abs(s[i + 1] - s[i]);
    return slope > 0 ? smoothedNoise / slope : Infinity;
  };
  if (left === null || right === null) return one(left ?? right);
  return 0.5 * Math.hypot(one(left), one(right));
}

/** The largest odd window ≤ min(wanted, n), but at least 5 (the filter's minimum; prepareSignal guarantees n ≥ 16). */
function largestOddWindow(wanted: number, n: number): number {
  let w = Math.min(wanted, n);
  if (w % 2 === 0) w--;
  return Math.max(5, w);
}
