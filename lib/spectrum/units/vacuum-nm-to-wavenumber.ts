// Vacuum wavelength (nm) to wavenumber (cm⁻¹). Use the VACUUM wavelength: an air wavelength gives a wrong wavenumber.
import { assertPositiveFinite } from "./assert-positive-finite";
import { NM_CM } from "./physical-constants";

/** Wavenumber in cm⁻¹ of light whose vacuum wavelength is `vacuumNm` (σ = 10⁷ / λ_vac). */
export function vacuumNmToWavenumber(vacuumNm: number): number {
  assertPositiveFinite(vacuumNm, "vacuumNm");
  return NM_CM / vacuumNm;
}
