// Vacuum → air for a whole wavelength axis (Morton 2000), returning a new array.
import type { AirVacuumOptions } from "./air-vacuum-options";
import { vacuumToAirNm } from "./vacuum-to-air-nm";

/** Air wavelengths in nm of every vacuum wavelength in `vacuumNm`; the input is not modified. */
export function xVacuumToAirNm(
  vacuumNm: Float64Array,
  options: AirVacuumOptions = {},
): Float64Array {
  const airNm = new Float64Array(vacuumNm.length);
  for (let i = 0; i < vacuumNm.length; i++) airNm[i] = vacuumToAirNm(vacuumNm[i], options);
  return airNm;
}
