// The lamp's typical line width on the array: the (upper) median FWHM of the peaks that have one.
// Pairing sizes its windows and its blend tests by it.
import type { LampPeak } from "./lamp-pairing-types";

/** The upper median of the peaks' positive FWHMs (x units); undefined with fewer than `minCount` of them. */
export function typicalPeakFwhm(peaks: readonly LampPeak[], minCount = 1): number | undefined {
  const widths = peaks
    .map((p) => p.fwhm)
    .filter((w): w is number => w !== undefined && w > 0)
    .sort((a, b) => a - b);
  return widths.length >= Math.max(1, minCount) ? widths[widths.length >> 1] : undefined;
}
