// Recalibration: the daily case. The instrument's previous calibration already knows the shape of its
// dispersion; overnight only the array's position and the image scale move a little (temperature, a
// knock). So today's axis is yesterday's model moved by a linear drift x = stretch·u + offset, and the
// only question is the drift: two numbers, which a handful of lamp lines pin down wherever they stand.
// The drift that puts the most (and strongest) lamp lines on peaks is searched over a grid, refined by
// least squares with the pairs that stray set aside, and trusted only when the lamp lines sit on it
// tightly, no other drift explains the peaks nearly as well, the drift is known well at both ends of
// the array, and most strong lamp lines found their peak. A drift that bends (the instrument was
// realigned) is not a drift: the caller then fits a fresh model.
import type { CalibrationModel } from "./calibration-model";
import { coveredByDrift } from "./covered-by-drift";
import { driftFitResult } from "./drift-fit-result";
import { driftGridSearch } from "./drift-grid-search";
import { driftedModel, type LinearDrift } from "./drifted-model";
import { fitDrift } from "./fit-drift";
import { inverseOfModel } from "./inverse-of-model";
import type { LampPairingResult } from "./lamp-pairing-types";
import type { PairingContext } from "./pairing-context";
import { predictedFromPrevious } from "./predicted-from-previous";
import { recalibrationChecks } from "./recalibration-checks";
import { RECALIBRATION_LIMITS } from "./recalibration-limits";
import { recalibrationResult } from "./recalibration-result";
import { rivalDrift } from "./rival-drift";
import { typicalPeakFwhm } from "./typical-peak-fwhm";

export interface RecalibrateFromPreviousOptions {
  /** Largest shift searched, as a fraction of the array. @default 0.03 */
  maxShiftFraction?: number;
  /** Largest relative stretch searched. @default 0.01 */
  maxStretch?: number;
  /**
   * x(λ) of `previous` on its domain, when the caller has already made it (inverting a model on a dense
   * grid is the costliest step of the setup). @default inverseOfModel(previous, previous.domain)
   */
  previousInverse?: (lambda: number) => number;
}

/** Peaks wider than this many typical line widths take no lamp line (as a sample's "broad" peaks). */
const BROAD_PEAK_FWHMS = 3;

/**
 * Today's calibration from `previous` and today's lamp peaks, or null when the previous calibration
 * cannot be moved onto today's array (another array length, a bent drift, too few lines). A result
 * is "paired" only when every check passes; otherwise "check", with the reasons and the candidate.
 * `context.lines` may be blend groups (a `wavelengthSigmaNm` is then added to their pairs' σ).
 */
export function recalibrateFromPrevious(
  context: PairingContext,
  previous: CalibrationModel,
  options: RecalibrateFromPreviousOptions = {},
): LampPairingResult | null {
  const { maxShiftFraction = 0.03, maxStretch = 0.01 } = options;
  const { peaks } = context;
  const [xMin, xMax] = context.domain;
  const span = xMax - xMin;
  const middle = 0.5 * (xMin + xMax);
  const previousSpan = previous.domain[1] - previous.domain[0];
  if (peaks.length < 2 || Math.abs(previousSpan - span) > maxShiftFraction * span) return null;

  let xOf: (lambda: number) => number;
  try {
    xOf = options.previousInverse ?? inverseOfModel(previous, previous.domain);
  } catch {
    return null;
  }
  // The matching tolerance is half the lines' own width on today's array, as measured.
  const fwhmX = typicalPeakFwhm(peaks) ?? 2 * context.toleranceX;
  const tolerance = 0.5 * fwhmX;
  const predicted = predictedFromPrevious(context, previous, xOf);
  if (predicted.length < RECALIBRATION_LIMITS.minPairs) return null;

  // A peak several line widths wide is continuum structure or a clump of lines: no lamp line's place.
  const order = peaks
    .map((_, i) => i)
    .filter((i) => !((peaks[i].fwhm ?? 0) > BROAD_PEAK_FWHMS * fwhmX))
    .sort((a, b) => peaks[a].x - peaks[b].x);
  const sortedX = order.map((i) => peaks[i].x);

  const search = driftGridSearch(
    predicted,
    sortedX,
    context.domain,
    tolerance,
    maxShiftFraction,
    maxStretch,
  );
  if (!search) return null;
  const { best, coarseRivals } = search;
  const fitted = fitDrift(
    context,
    predicted,
    sortedX,
    order,
    tolerance,
    (u) => middle + (u - middle) * best.stretch + best.shift,
    maxStretch,
  );
  if (!fitted) return null;
  if (fitted.bendX > RECALIBRATION_LIMITS.maxBend * tolerance) return null;

  const { drift, pairs } = fitted;
  const model = driftedModel(previous, drift, context.domain);
  const covered = coveredByDrift(drift, previous, pairs, context.domain, tolerance);
  const fit = driftFitResult(model, fitted, covered);
  const rival = rivalDrift(
    context,
    predicted,
    sortedX,
    order,
    tolerance,
    coarseRivals,
    fitted,
    maxStretch,
  );
  const words = driftWords(drift, context.domain);
  const verdict = recalibrationChecks(
    context,
    previous,
    predicted,
    tolerance,
    fitted,
    model,
    covered,
    rival.score,
    words,
  );
  return recalibrationResult(context, verdict, fit, pairs, rival, words);
}

function signed(value: number, digits: number): string {
  return `${value >= 0 ? "+" : "−"}${Math.abs(value).toFixed(digits)}`;
}

/** How far `drift` moved the middle of the array `domain` and how much it stretched it, in words. */
function driftWords(
  drift: LinearDrift,
  [xMin, xMax]: [number, number],
): { moved: string; stretched: string } {
  const middle = 0.5 * (xMin + xMax);
  const todayX = (u: number) => drift.stretch * u + drift.offset;
  return {
    moved: `moved by ${signed(todayX(middle) - middle, 2)} x units at the middle`,
    stretched: `stretched by ${signed(100 * (drift.stretch - 1), 3)} %`,
  };
}
