// The peak finder in one call: prepare the signal (smooth, continuum, noise, clipping), then pick peaks.
import type { Peak } from "../types";
import { prepareSignal, type PrepareSignalOptions } from "../signal/prepare-signal";
import { pickPeaks, type PickPeaksOptions } from "./pick-peaks";

export interface FindPeaksOptions extends PrepareSignalOptions, PickPeaksOptions {}

/**
 * Emission peaks of the spectrum (x, y), sorted by x; x strictly increasing (pixels or a
 * wavelength axis, uniform or not). To show the continuum-removed data as well, call
 * prepareSignal and pickPeaks separately; this is exactly their composition.
 */
export function findPeaks(
  x: Float64Array,
  y: Float64Array,
  options: FindPeaksOptions = {},
): Peak[] {
  const { minSnr, minDipSnr, blendSeparationFwhm, areaHalfWidthFwhm, shoulderSnr, ...prepare } =
    options;
  const signal = prepareSignal(x, y, prepare);
  return pickPeaks(x, signal, {
    minSnr,
    minDipSnr,
    blendSeparationFwhm,
    areaHalfWidthFwhm,
    shoulderSnr,
  });
}
