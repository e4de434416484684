// Public API of the unit conversions: nm ⇄ Å ⇄ cm⁻¹ ⇄ eV and air ⇄ vacuum (Morton 2000).
export {
  SPEED_OF_LIGHT_M_PER_S,
  PLANCK_J_S,
  ELEMENTARY_CHARGE_C,
  HC_EV_NM,
  NM_PER_ANGSTROM,
  NM_PER_MICROMETRE,
  NM_CM,
} from "./physical-constants";
export { wavenumberToVacuumNm } from "./wavenumber-to-vacuum-nm";
export { vacuumNmToWavenumber } from "./vacuum-nm-to-wavenumber";
export { vacuumNmToEnergyEv } from "./vacuum-nm-to-energy-ev";
export { energyEvToVacuumNm } from "./energy-ev-to-vacuum-nm";
export { refractiveIndexOfAir, AIR_FORMULA_MIN_VACUUM_NM } from "./refractive-index-of-air";
export type { AirVacuumOptions } from "./air-vacuum-options";
export { vacuumToAirNm } from "./vacuum-to-air-nm";
export { airToVacuumNm, AIR_FORMULA_MIN_AIR_NM } from "./air-to-vacuum-nm";
export { xVacuumToAirNm } from "./x-vacuum-to-air-nm";
export { xAirToVacuumNm } from "./x-air-to-vacuum-nm";
export { conventionalWavelengthNm } from "./conventional-wavelength-nm";
export type {
  ConventionalWavelength,
  ConventionalWavelengthNmOptions,
} from "./conventional-wavelength-nm";
export { toNanometres } from "./to-nanometres";
export type { ToNanometresOptions } from "./to-nanometres";
export { spectrumToNanometres } from "./spectrum-to-nanometres";
export type { SpectrumToNanometresOptions } from "./spectrum-to-nanometres";
