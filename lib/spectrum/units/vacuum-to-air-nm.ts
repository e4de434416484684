// Vacuum → air wavelength by the IAU standard (Morton 2000, ApJS 130, 403, after Edlén 1966): λ_air = λ_vac / n(λ_vac).
import type { AirVacuumOptions } from "./air-vacuum-options";
import { assertPositiveFinite } from "./assert-positive-finite";
import { AIR_FORMULA_MIN_VACUUM_NM, refractiveIndexOfAir } from "./refractive-index-of-air";

/**
 * Air wavelength in nm of the vacuum wavelength `vacuumNm`. Valid for λ_vac ≥ 200 nm; below that
 * see `options.belowRange`.
 */
export function vacuumToAirNm(vacuumNm: number, options: AirVacuumOptions = {}): number {
  const { belowRange = "throw" } = options;
  assertPositiveFinite(vacuumNm, "vacuumNm");
  if (vacuumNm < AIR_FORMULA_MIN_VACUUM_NM) {
    if (belowRange === "unchanged") return vacuumNm;
    throw new RangeError(
      `vacuumNm = ${vacuumNm} is below 200 nm, where the Morton (2000) air formula does not apply ` +
        `(pass belowRange: "unchanged" to keep such wavelengths in vacuum)`,
    );
  }
  return vacuumNm / refractiveIndexOfAir(vacuumNm);
}
