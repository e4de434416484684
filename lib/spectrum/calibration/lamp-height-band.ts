// How strong a lamp peak may be for a line, judged from the pairs made so far: lamp tables, lamps and
// detector responses disagree by a factor of a few (common practice), so the band is loose. It stops
// a strong line from taking a faint stray peak, and a faint line from taking a strong peak that other
// light (an unlisted line, a blend) must have made.
import type { LampLine, LampPair, LampPeak } from "./lamp-pairing-types";
import { upperMedian } from "../statistics/upper-median";

/** Pairs below which the band is open (the pairs are too few to say). */
const MIN_PAIRS = 6;

/**
 * Plausible ln(height / intensity) of a new pair: the pairs' median ± the larger of ln(heightTolerance)
 * and 3 robust σ; [−∞, ∞] while the pairs are fewer than six.
 */
export function lampHeightBand(
  pairs: readonly LampPair[],
  peaks: readonly LampPeak[],
  lines: readonly LampLine[],
  heightTolerance: number,
): [number, number] {
  const ratios = pairs
    .filter((p) => peaks[p.peakIndex].height > 0 && lines[p.lineIndex].intensity > 0)
    .map((p) => Math.log(peaks[p.peakIndex].height / lines[p.lineIndex].intensity));
  if (ratios.length < MIN_PAIRS) return [-Infinity, Infinity];
  const median = upperMedian(ratios);
  const halfWidth = Math.max(
    Math.log(heightTolerance),
    3 * 1.4826 * upperMedian(ratios.map((r) => Math.abs(r - median))),
  );
  return [median - halfWidth, median + halfWidth];
}

/** Whether a peak of `height` fits a line of `intensity` inside `band`; true when either is not positive. */
export function heightInBand(
  height: number,
  intensity: number,
  [low, high]: [number, number],
): boolean {
  if (!(intensity > 0 && height > 0)) return true;
  const ratio = Math.log(height / intensity);
  return ratio >= low && ratio <= high;
}
