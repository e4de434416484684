// Whether a pair's line lies inside a calibration's covered range. The range a trusted automatic
// pairing claims ends at pairs' own wavelengths and may leave used pairs outside it (they shape the
// fit, the calibration does not vouch for itself there); the calibration page and the workbench mark
// them alike.

/** True when `wavelengthNm` lies within `coveredRangeNm` (ends included). */
export function withinCoveredRange(
  wavelengthNm: number,
  coveredRangeNm: readonly [number, number],
): boolean {
  return wavelengthNm >= coveredRangeNm[0] && wavelengthNm <= coveredRangeNm[1];
}
