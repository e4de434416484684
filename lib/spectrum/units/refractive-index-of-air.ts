// Refractive index of standard air: the IAU conversion of Morton (2000, ApJS 130, 403, eq. 3), after Edlén (1966).
import { assertPositiveFinite } from "./assert-positive-finite";

/** Shortest vacuum wavelength, in nm, for which the Morton (2000) formula is meant (λ > 2000 Å). */
export const AIR_FORMULA_MIN_VACUUM_NM = 200;

/**
 * n(λ_vac) = 1 + 8.34254e-5 + 2.406147e-2/(130 − s²) + 1.5998e-4/(38.9 − s²),
 * with s = 10⁴/λ_vac[Å] in µm⁻¹ (= 10³/λ_vac[nm]). Takes the VACUUM wavelength, as Morton states it.
 * No range check here: callers decide what to do below 200 nm (the poles sit near 88 and 160 nm).
 */
export function refractiveIndexOfAir(vacuumNm: number): number {
  assertPositiveFinite(vacuumNm, "vacuumNm");
  const s2 = (1e3 / vacuumNm) ** 2;
  return 1 + 8.34254e-5 + 2.406147e-2 / (130 - s2) + 1.5998e-4 / (38.9 - s2);
}
