// The wavelength as line tables conventionally give it: air above 200 nm, vacuum below.
import type { WavelengthMedium } from "../types";
import { assertPositiveFinite } from "./assert-positive-finite";
import { AIR_FORMULA_MIN_VACUUM_NM } from "./refractive-index-of-air";
import { vacuumToAirNm } from "./vacuum-to-air-nm";

export interface ConventionalWavelengthNmOptions {
  /**
   * Vacuum wavelength in nm above which tables return to vacuum wavelengths. Some tables (the NIST
   * Atomic Spectra Database's default output) give vacuum again above 2000 nm; this project's
   * convention is air all the way up.
   * @default Infinity
   */
  maxAirNm?: number;
}

export interface ConventionalWavelength {
  /** The wavelength in nm, in `medium`. */
  wavelengthNm: number;
  /** The medium the convention chose for this wavelength. */
  medium: WavelengthMedium;
}

/** Air wavelength (Morton 2000) when 200 nm ≤ λ_vac ≤ maxAirNm, else the vacuum wavelength unchanged. */
export function conventionalWavelengthNm(
  vacuumNm: number,
  options: ConventionalWavelengthNmOptions = {},
): ConventionalWavelength {
  const { maxAirNm = Infinity } = options;
  assertPositiveFinite(vacuumNm, "vacuumNm");
  if (Number.isNaN(maxAirNm) || maxAirNm < AIR_FORMULA_MIN_VACUUM_NM) {
    throw new RangeError(`maxAirNm must be at least 200 nm, got ${String(maxAirNm)}`);
  }
  if (vacuumNm < AIR_FORMULA_MIN_VACUUM_NM || vacuumNm > maxAirNm) {
    return { wavelengthNm: vacuumNm, medium: "vacuum" };
  }
  return { wavelengthNm: vacuumToAirNm(vacuumNm), medium: "air" };
}
