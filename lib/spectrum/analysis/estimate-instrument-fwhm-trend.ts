// Estimates how the instrument's line width changes across an axis already in nm that came with no
// stated resolution: a grating's FWHM in nm is nearly constant, a prism's grows steeply to the red
// (its dispersion falls), so one number cannot serve a prism. The width is read from the sample's
// own clean peaks as a power law, fitted robustly in log–log.
import { TheilSenRegression } from "ml-regression-theil-sen";
import { assertIntegerInRange } from "../signal/assert-integer-in-range";
import type { Peak } from "../types";
import { assertNonNegativeFinite } from "../units/assert-non-negative-finite";

export interface EstimateInstrumentFwhmTrendOptions {
  /** Only peaks at least this far above the noise take part.
   * @default 20 */
  minSnr?: number;
  /** How many of the highest-SNR clean peaks are looked at.
   * @default 30 */
  maxPeaks?: number;
  /** Fewer clean peaks than this give no trend.
   * @default 5 */
  minPeaks?: number;
  /** The peaks must span at least this ratio of longest to shortest x for a slope to be read.
   * @default 1.15 */
  minSpanRatio?: number;
  /** The exponent is kept within ±maxExponent (a dense flint prism's FWHM in nm rises about as λ³
   * in the visible; common practice).
   * @default 5 */
  maxExponent?: number;
}

/** FWHM(x) = fwhm · (x / referenceX)^exponent, in the units of x. */
export interface InstrumentFwhmTrend {
  fwhm: number;
  referenceX: number;
  exponent: number;
}

/**
 * Theil–Sen line through ln FWHM against ln x of the `maxPeaks` highest-SNR peaks with SNR ≥ minSnr
 * that are neither saturated nor blended; referenceX is their geometric mean x, where the line's
 * value is taken. The median of pairwise slopes lets a band or an unflagged blend among them pass
 * (up to about three in ten). Null when fewer than minPeaks qualify or they span too little of the
 * axis to read a slope.
 */
export function estimateInstrumentFwhmTrend(
  peaks: readonly Peak[],
  options: EstimateInstrumentFwhmTrendOptions = {},
): InstrumentFwhmTrend | null {
  const {
    minSnr = 20,
    maxPeaks = 30,
    minPeaks = 5,
    minSpanRatio = 1.15,
    maxExponent = 5,
  } = options;
  assertNonNegativeFinite(minSnr, "minSnr");
  assertIntegerInRange(maxPeaks, "maxPeaks", 2);
  assertIntegerInRange(minPeaks, "minPeaks", 2);
  if (!(minSpanRatio >= 1) || !Number.isFinite(minSpanRatio)) {
    throw new RangeError(`minSpanRatio must be a finite number ≥ 1, got ${minSpanRatio}`);
  }
  assertNonNegativeFinite(maxExponent, "maxExponent");
  const clean = peaks
    .filter(
      (peak) =>
        !peak.saturated &&
        !peak.blended &&
        peak.snr >= minSnr &&
        peak.x > 0 &&
        peak.fwhm > 0 &&
        Number.isFinite(peak.x) &&
        Number.isFinite(peak.fwhm),
    )
    .sort((a, b) => b.snr - a.snr || a.x - b.x)
    .slice(0, maxPeaks);
  if (clean.length < minPeaks) return null;
  const logX = clean.map((peak) => Math.log(peak.x));
  const logFwhm = clean.map((peak) => Math.log(peak.fwhm));
  if (Math.max(...logX) - Math.min(...logX) < Math.log(minSpanRatio)) return null;
  const line = new TheilSenRegression(logX, logFwhm);
  const meanLogX = logX.reduce((sum, v) => sum + v, 0) / logX.length;
  const exponent = Math.max(-maxExponent, Math.min(maxExponent, line.slope));
  const fwhm = Math.exp(line.predict(meanLogX));
  if (!(fwhm > 0) || !Number.isFinite(fwhm) || !Number.isFinite(exponent)) return null;
  return { fwhm, referenceX: Math.exp(meanLogX), exponent };
}

/** The trend's FWHM at x. */
export function instrumentFwhmAt(trend: InstrumentFwhmTrend, x: number): number {
  return trend.fwhm * (x / trend.referenceX) ** trend.exponent;
}
