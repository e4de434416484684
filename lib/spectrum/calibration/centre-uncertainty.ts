// How well a lamp peak's centre is known, beyond the peak finder's own σ from noise: a floor for every
// centre, and an allowance for a peak that is probably two lines (wider than its clean neighbours, or
// split from one), whose centre an unlisted neighbour pulls.
import type { LampPeak } from "./lamp-pairing-types";
import { upperMedian, upperMedianOfSorted } from "../statistics/upper-median";

/** Peaks compared for width with this many neighbours on either side. */
const WIDTH_NEIGHBOURS = 8;

/**
 * No centre is known better than this share of the local FWHM, whatever the peak finder says: an
 * unlisted neighbour or a line table's last digit moves a sharp peak's centre more than its noise does,
 * and a fit that believes a σ of 0.01 px follows that one pair (a right curved-grating pairing once
 * missed by 0.2 nm between its pairs). Measured on the blind sweep (seeds 123456 and 223456, n 150
 * each): +2–3 points of success; 0.06 did no better.
 */
export const CENTRE_FLOOR_FWHM = 0.03;

/** Gaussian FWHM over σ, 2√(2 ln 2) (a standard result). */
const FWHM_PER_SIGMA = 2 * Math.sqrt(2 * Math.LN2);

/**
 * The centre of a blend of two lines moves by p·d towards the other line (p its share of the light, d
 * the separation) while the profile's variance grows by p(1 − p)·d²: for a weaker, unlisted neighbour
 * (p ≲ 0.2) the shift is about half the extra σ. A σ of that size is what a wide peak's centre is
 * worth. The generator's pulled end pairs were 1.08–1.14 times as wide as their clean neighbours,
 * below the reach of the old rule (σ only beyond 1.2 times the median width). With SPLIT_BLEND_SHARE
 * and the noise allowance, over 1500 blind instruments (seeds 9500000–9900000 of the CLI's mix and the
 * unit sweep's seed 1000): silent wrong 14 → 10, success 797 → 796; over 400 recalibrations (seeds
 * 9800000 and 1000): silent wrong 1 → 0, success 330 → 327. Without the noise allowance the blind
 * figures were the same at 800 successes, but the recalibrations fell to 323: every clean centre's σ
 * grew with its width's noise, and the drift's covered range shrank with it.
 */
const PULL_PER_EXTRA_SIGMA = 0.5;

/**
 * A peak the peak finder found overlapping a neighbour (a shoulder, or split from one) has a centre
 * that belongs partly to the neighbour: its σ is at least this share of the clean width. Such pairs
 * sat 0.7–1.3 px off at 5 px FWHM on the sweep, several at the end of a covered range.
 */
const SPLIT_BLEND_SHARE = 0.25;

/** Each peak's neighbours' widths (WIDTH_NEIGHBOURS either side, itself included) ascending; null below five. */
function neighbourWidths(peaks: readonly LampPeak[]): (number[] | null)[] {
  const order = peaks.map((_, i) => i).sort((a, b) => peaks[a].x - peaks[b].x);
  const position = new Map(order.map((p, k) => [p, k]));
  return peaks.map((_, i) => {
    const k = position.get(i)!;
    const widths = order
      .slice(Math.max(0, k - WIDTH_NEIGHBOURS), k + WIDTH_NEIGHBOURS + 1)
      .map((p) => peaks[p].fwhm)
      .filter((w): w is number => w !== undefined && w > 0)
      .sort((a, b) => a - b);
    return widths.length >= 5 ? widths : null;
  });
}

/**
 * A peak wider than its clean neighbours is most likely two lines, one of them perhaps unlisted, and
 * its centre is pulled towards the other: its centre uncertainty grows with the extra width (see
 * PULL_PER_EXTRA_SIGMA), so that fits weigh it down instead of following it. The clean width is the
 * lower quartile of the neighbours' (blends only widen a line). A peak the finder marked blended gets
 * at least SPLIT_BLEND_SHARE of the clean width. Every centre also gets the floor above. Blind,
 * manual and drift pairing all weigh centres this way: the drift is measured against the previous
 * model, whose residuals hold the pulls it weighed down, and weights that differ from the previous
 * fit's moved a recalibration of the very same lamp file by 0.01 nm.
 */
export function withBlendUncertainty(peaks: LampPeak[]): LampPeak[] {
  return withCentreUncertainty(peaks, true);
}

/**
 * Every centre gets the floor of CENTRE_FLOOR_FWHM and nothing else: the weighting of a prism's
 * whole-array draws. There the finder's own σ had left saturated and strong centres at under 0.005 px,
 * so a fit followed them; with the floor, over 1,100 blind instruments (seeds 9500000, 9600000,
 * 9800000, 9900000 and 1000) success rose by 21 with the same 8 silent wrongs, and by 18 with the
 * same 2 on fresh seeds (10600000 n 300, prisms of 10700000 n 200). Growth's blend allowance there
 * instead cost 8 successes for 3 fewer silent wrongs on the first seeds, and gained 1 for 3 more on
 * the fresh ones.
 */
export function withCentreFloor(peaks: LampPeak[]): LampPeak[] {
  return withCentreUncertainty(peaks, false);
}

/**
 * How far each peak's centre may be pulled by a neighbour it blends with (see PULL_PER_EXTRA_SIGMA and
 * SPLIT_BLEND_SHARE), in x; 0 for a clean peak, and for one without the width or neighbours to judge.
 */
function blendPulls(peaks: readonly LampPeak[]): number[] {
  const neighbours = neighbourWidths(peaks);
  return peaks.map((peak, i) => blendPull(peak, neighbours[i]));
}

/** The pull of `peak`'s centre (see blendPulls), given its neighbours' widths ascending. */
function blendPull(peak: LampPeak, widths: number[] | null): number {
  if (!(peak.fwhm !== undefined && peak.fwhm > 0) || !widths) return 0;
  const clean = widths[Math.floor(0.25 * (widths.length - 1))];
  // A width measured with noise scatters by about 1/SNR of itself: within two of those a peak is clean.
  const noiseShare = peak.snr !== undefined && peak.snr > 0 ? 2 / peak.snr : 0;
  const cleanWithNoise = clean * (1 + noiseShare);
  const extraSigma = Math.sqrt(Math.max(0, peak.fwhm ** 2 - cleanWithNoise ** 2)) / FWHM_PER_SIGMA;
  return Math.max(PULL_PER_EXTRA_SIGMA * extraSigma, peak.blended ? SPLIT_BLEND_SHARE * clean : 0);
}

function withCentreUncertainty(peaks: LampPeak[], blends: boolean): LampPeak[] {
  const neighbours = neighbourWidths(peaks);
  return peaks.map((peak, i) => {
    const widths = neighbours[i];
    if (!(peak.fwhm !== undefined && peak.fwhm > 0) || !widths) return peak;
    const floor = CENTRE_FLOOR_FWHM * upperMedianOfSorted(widths);
    const pull = blends ? blendPull(peak, widths) : 0;
    return { ...peak, xUncertainty: Math.hypot(peak.xUncertainty ?? 0, pull, floor) };
  });
}

/**
 * A centre more uncertain than this many times the reference pairs' median is not sound: the peak
 * finder's σ of a peak cut by the array's edge is its whole width.
 */
const EDGE_SIGMA_RATIO = 2;

/**
 * A pull up to this share of the peak's FWHM leaves its centre sound: the sweep's accuracy is a tenth
 * of the FWHM. Over 1,500 blind instruments (prisms of seeds 12100000 and 12200000, the CLI's mix of
 * 12400000 and 1000, 2048-pixel arrays of 1000), with `claimSoundEnds` and `predictedByTheRest`, this
 * share gave 952 successes and 11 silent wrongs where neither rule stood at 924 and 16; the claim
 * narrowed the covered range of 286 of the 924 calibrations right before, by 5 % of the array on
 * average (32 % at most). Allowing no pull at all gave 944 and 10, but narrowed 575 of them, by 8 %
 * (68 % at most).
 */
const SOUND_PULL_FWHM = 0.1;

/**
 * Whether a pair's peak centre is sound, judged against `reference` pairs: no neighbour widens or
 * splits its peak by more than SOUND_PULL_FWHM of its width, and its σ is at most twice the reference
 * pairs' median. A pair whose centre is not sound is off by a pull that becomes the calibration's
 * error wherever it alone decides the calibration.
 */
export function soundCentres(
  peaks: readonly LampPeak[],
  reference: readonly { peakIndex: number }[],
): (pair: { peakIndex: number }) => boolean {
  const pulls = blendPulls(peaks);
  const sigmaOf = (pair: { peakIndex: number }) => peaks[pair.peakIndex].xUncertainty ?? 0;
  const limit = EDGE_SIGMA_RATIO * upperMedian(reference.map(sigmaOf));
  return (pair) =>
    pulls[pair.peakIndex] <= SOUND_PULL_FWHM * (peaks[pair.peakIndex].fwhm ?? 0) &&
    sigmaOf(pair) <= limit;
}
