// Turns a parsed wavelength or wavenumber axis into nm, in the medium the caller asks for.
import type { AxisUnit, WavelengthMedium } from "../types";
import { NM_CM, NM_PER_ANGSTROM } from "./physical-constants";
import type { AirVacuumOptions } from "./air-vacuum-options";
import { airToVacuumNm } from "./air-to-vacuum-nm";
import { vacuumToAirNm } from "./vacuum-to-air-nm";

export interface ToNanometresOptions extends AirVacuumOptions {
  /**
   * Unit of `x`. Pixels have no wavelength until a calibration gives them one, so "pixel" is refused.
   * @default "nm"
   */
  unit?: AxisUnit;
  /**
   * Medium in which `x` was measured when it is a wavelength (nm or Å). Wavenumbers are vacuum by
   * definition and ignore this. Needed only when `medium` asks for the other medium.
   * @default undefined (unknown)
   */
  inputMedium?: WavelengthMedium;
  /**
   * Medium of the result. Left out, the result stays in the input's medium (vacuum for wavenumbers).
   * @default the input's medium
   */
  medium?: WavelengthMedium;
}

/**
 * Wavelengths in nm for the axis `x`, element by element (a wavenumber axis, once turned into
 * wavelengths, runs the other way; `x` is not reordered). Wavenumbers give VACUUM wavelengths
 * (λ_vac = 10⁷/σ); air is then reached by Morton (2000).
 */
export function toNanometres(x: Float64Array, options: ToNanometresOptions = {}): Float64Array {
  const { unit = "nm", inputMedium, medium, belowRange } = options;
  if (unit === "pixel") {
    throw new RangeError(
      "a pixel axis has no wavelength until it is calibrated; calibrate it first",
    );
  }
  if (unit !== "nm" && unit !== "angstrom" && unit !== "wavenumber") {
    throw new RangeError(`unknown unit ${JSON.stringify(unit)}`);
  }
  const fromMedium: WavelengthMedium | undefined = unit === "wavenumber" ? "vacuum" : inputMedium;
  if (medium !== undefined && fromMedium === undefined) {
    throw new RangeError(
      `the ${medium} wavelengths asked for need inputMedium: in which medium was x measured?`,
    );
  }
  const out = new Float64Array(x.length);
  for (let i = 0; i < x.length; i++) {
    const value = x[i];
    if (!Number.isFinite(value) || (unit === "wavenumber" && value <= 0)) {
      throw new RangeError(`x[${i}] = ${value} cannot be turned into a wavelength`);
    }
    let nm = unit === "nm" ? value : unit === "angstrom" ? value * NM_PER_ANGSTROM : NM_CM / value;
    if (medium === "air" && fromMedium === "vacuum") nm = vacuumToAirNm(nm, { belowRange });
    else if (medium === "vacuum" && fromMedium === "air") nm = airToVacuumNm(nm, { belowRange });
    out[i] = nm;
  }
  return out;
}
