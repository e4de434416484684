// Wavenumber (cm⁻¹) to wavelength (nm). A wavenumber is a vacuum quantity, so the result is a vacuum wavelength.
import { assertPositiveFinite } from "./assert-positive-finite";
import { NM_CM } from "./physical-constants";

/** Vacuum wavelength in nm of light with the given wavenumber in cm⁻¹ (λ = 10⁷ / σ). */
export function wavenumberToVacuumNm(wavenumberPerCm: number): number {
  assertPositiveFinite(wavenumberPerCm, "wavenumberPerCm");
  return NM_CM / wavenumberPerCm;
}
