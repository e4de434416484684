// Chooses which tabulated wavelength of a reference line to compare with an observed peak.

import type { ReferenceLine, WavelengthMedium } from "../types";

/** Tables give air wavelengths above 200 nm and vacuum ones below (common practice). */
const AIR_VACUUM_BOUNDARY_NM = 200;

/**
 * The line's wavelength on the axis the peaks were calibrated on. "air" follows the tables'
 * convention (air above 200 nm, vacuum below, as lamp calibrations are fitted against them);
 * "vacuum" uses vacuum wavelengths throughout.
 */
export function wavelengthForMatchingNm(
  line: ReferenceLine,
  medium: WavelengthMedium = "air",
): number {
  if (medium === "vacuum") return line.vacuumNm;
  return line.vacuumNm < AIR_VACUUM_BOUNDARY_NM ? line.vacuumNm : line.airNm;
}
