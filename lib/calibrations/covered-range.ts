// Whether a pair's line lies inside a calibration's covered range. The range a trusted automatic
// pairing claims ends at pairs' own wavelengths and may leave used pairs outside it (they shape the
// fit, the calibration does not vouch for itself there); a recalibration's range is where its drift
// is known, worked out through the model, so its end can fall a residual short of an end pair. The
// calibration page and the workbench mark the pairs outside alike.

/**
 * A line this close beyond an end counts as at it: line tables give wavelengths to a thousandth of a
 * nm, and a recalibration's end, worked out through the model, can miss an end pair's line by its
 * residual (the e2e workbench's recalibrated lamp marked its end pair, Ar I 852.144 nm, outside a
 * range shown as ending at 852.14 nm).
 */
const END_SLACK_NM = 0.001;

/** True when `wavelengthNm` lies within `coveredRangeNm` (ends included, within END_SLACK_NM). */
export function withinCoveredRange(
  wavelengthNm: number,
  coveredRangeNm: readonly [number, number],
): boolean {
  return (
    wavelengthNm >= coveredRangeNm[0] - END_SLACK_NM &&
    wavelengthNm <= coveredRangeNm[1] + END_SLACK_NM
  );
}
