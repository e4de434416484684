// The lamp's typical line width on the array, from the stronger half of the peaks that have one: weak
// bumps on the continuum and blends of unlisted lines are broad, and a sparse lamp has more of them
// than lines (a mercury lamp's 27 peaks once gave a "typical" width eight times its lines'). Pairing
// sizes its windows and its blend tests by it.
import type { LampPeak } from "./lamp-pairing-types";
import { upperMedian } from "../statistics/upper-median";

/** Fewer measured peaks than this are all taken. */
const STRONG_HALF_FROM = 6;

/**
 * The upper median of the positive FWHMs (x units) of the stronger half of the peaks (all of them when
 * few); undefined with fewer than `minCount` measured peaks.
 */
export function typicalPeakFwhm(peaks: readonly LampPeak[], minCount = 1): number | undefined {
  const measured = peaks.filter((p) => p.fwhm !== undefined && p.fwhm > 0);
  if (measured.length < Math.max(1, minCount)) return undefined;
  const taken =
    measured.length >= STRONG_HALF_FROM
      ? measured
          .slice()
          .sort((a, b) => b.height - a.height)
          .slice(0, Math.ceil(measured.length / 2))
      : measured;
  return upperMedian(taken.map((p) => p.fwhm as number));
}
