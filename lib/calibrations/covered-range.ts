// Whether a pair lies inside a calibration's covered range. The range a trusted automatic pairing
// claims ends at pairs' own line wavelengths and may leave used pairs outside it (they shape the fit,
// the calibration does not vouch for itself there); a recalibration's range is where its drift is
// known, worked out through the model, so its end is a calibrated wavelength, and an end pair's line
// can stand beyond it by the pair's residual. The calibration page and the workbench mark the pairs
// outside alike.

/** A line this close beyond an end counts as at it: line tables give wavelengths to 0.001 nm. */
const END_SLACK_NM = 0.001;

/**
 * True when the pair's line wavelength, or its place on the calibrated axis (the line's wavelength
 * less its residual), lies within `coveredRangeNm`, ends included.
 */
export function withinCoveredRange(
  pair: { wavelengthNm: number; residualNm: number },
  coveredRangeNm: readonly [number, number],
): boolean {
  const [low, high] = [coveredRangeNm[0] - END_SLACK_NM, coveredRangeNm[1] + END_SLACK_NM];
  const within = (nm: number) => nm >= low && nm <= high;
  return within(pair.wavelengthNm) || within(pair.wavelengthNm - pair.residualNm);
}
