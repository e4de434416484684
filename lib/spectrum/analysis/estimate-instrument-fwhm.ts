// Estimates the instrument's line-profile width from the sample's own clearest peaks, for when the
// chemist gave no resolution: what the strongest clean lines measure is what one line looks like.
import { median } from "../statistics/median";
import type { Peak } from "../types";
import { assertNonNegativeFinite } from "../units/assert-non-negative-finite";

export interface EstimateInstrumentFwhmOptions {
  /** Only peaks at least this far above the noise take part: their FWHM is measured to a few per
   * cent, where a weak peak's half-height crossings wander with the noise.
   * @default 20 */
  minSnr?: number;
  /** How many of the highest-SNR clean peaks are looked at.
   * @default 10 */
  maxPeaks?: number;
  /** Fewer clean peaks than this give no estimate (a median of one or two is no robust value).
   * @default 3 */
  minPeaks?: number;
}

/**
 * Median FWHM, in the peaks' x units (pixels on a pixel axis), of the `maxPeaks` highest-SNR peaks
 * with SNR ≥ minSnr that are neither saturated (a clipped top reads wide) nor blended (two lines
 * read wide); null when fewer than `minPeaks` qualify. The median lets a few odd peaks (a band, an
 * unflagged blend) pass without moving the value.
 */
export function estimateInstrumentFwhm(
  peaks: readonly Peak[],
  options: EstimateInstrumentFwhmOptions = {},
): number | null {
  const { minSnr = 20, maxPeaks = 10, minPeaks = 3 } = options;
  assertNonNegativeFinite(minSnr, "minSnr");
  assertPositiveInteger("maxPeaks", maxPeaks);
  assertPositiveInteger("minPeaks", minPeaks);
  const widths = peaks
    .filter(
      (peak) =>
        !peak.saturated &&
        !peak.blended &&
        peak.snr >= minSnr &&
        peak.fwhm > 0 &&
        Number.isFinite(peak.fwhm),
    )
    .sort((a, b) => b.snr - a.snr || a.x - b.x)
    .slice(0, maxPeaks)
    .map((peak) => peak.fwhm);
  if (widths.length < minPeaks) return null;
  return median(widths);
}

function assertPositiveInteger(name: string, value: number): void {
  if (!Number.isInteger(value) || value < 1) {
    throw new RangeError(`${name} must be a positive integer, got ${value}`);
  }
}
