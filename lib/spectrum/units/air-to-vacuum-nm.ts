// Air → vacuum wavelength: Newton iteration on the Morton (2000) forward formula, so both directions are exact inverses.
// We iterate rather than use a separately fitted inverse formula because a fitted inverse agrees with the
// forward one only to ~1e-8 relative; Newton makes air→vacuum→air return the input to ~1e-12 nm.
import type { AirVacuumOptions } from "./air-vacuum-options";
import { assertPositiveFinite } from "./assert-positive-finite";
import { AIR_FORMULA_MIN_VACUUM_NM, refractiveIndexOfAir } from "./refractive-index-of-air";

/** The air wavelength of 200 nm vacuum (≈ 199.936 nm): the lowest air input the formula covers. */
export const AIR_FORMULA_MIN_AIR_NM =
  AIR_FORMULA_MIN_VACUUM_NM / refractiveIndexOfAir(AIR_FORMULA_MIN_VACUUM_NM);

const TOLERANCE_NM = 1e-12;
const MAX_ITERATIONS = 20;

/**
 * Vacuum wavelength in nm of the air wavelength `airNm`, solving λ_vac / n(λ_vac) = λ_air to 1e-12 nm
 * (or to a few ulps of λ where that is coarser). Valid for λ_air ≥ 199.936 nm; below see `options.belowRange`.
 */
export function airToVacuumNm(airNm: number, options: AirVacuumOptions = {}): number {
  const { belowRange = "throw" } = options;
  assertPositiveFinite(airNm, "airNm");
  if (airNm < AIR_FORMULA_MIN_AIR_NM) {
    if (belowRange === "unchanged") return airNm;
    throw new RangeError(
      `airNm = ${airNm} is below ${AIR_FORMULA_MIN_AIR_NM.toFixed(3)} nm (200 nm in vacuum), where the ` +
        `Morton (2000) air formula does not apply (pass belowRange: "unchanged" to keep it as it is)`,
    );
  }
  let vacuumNm = airNm * refractiveIndexOfAir(airNm);
  for (let iteration = 0; iteration < MAX_ITERATIONS; iteration++) {
    const n = refractiveIndexOfAir(vacuumNm);
    const residualNm = vacuumNm / n - airNm;
    const slope = 1 / n - (vacuumNm * refractiveIndexOfAirSlope(vacuumNm)) / (n * n);
    const stepNm = residualNm / slope;
    vacuumNm -= stepNm;
    if (Math.abs(stepNm) <= Math.max(TOLERANCE_NM, 4 * Number.EPSILON * vacuumNm)) break;
  }
  return vacuumNm;
}

/** dn/dλ_vac in nm⁻¹ of the Morton (2000) formula. */
function refractiveIndexOfAirSlope(vacuumNm: number): number {
  const s = 1e3 / vacuumNm;
  const s2 = s * s;
  const dnds = 2 * s * (2.406147e-2 / (130 - s2) ** 2 + 1.5998e-4 / (38.9 - s2) ** 2);
  // ds/dλ = −s/λ
  return (dnds * -s) / vacuumNm;
}
