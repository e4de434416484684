// Air → vacuum for a whole wavelength axis (Newton inverse of Morton 2000), returning a new array.
import type { AirVacuumOptions } from "./air-vacuum-options";
import { airToVacuumNm } from "./air-to-vacuum-nm";

/** Vacuum wavelengths in nm of every air wavelength in `airNm`; the input is not modified. */
export function xAirToVacuumNm(airNm: Float64Array, options: AirVacuumOptions = {}): Float64Array {
  const vacuumNm = new Float64Array(airNm.length);
  for (let i = 0; i < airNm.length; i++) vacuumNm[i] = airToVacuumNm(airNm[i], options);
  return vacuumNm;
}
