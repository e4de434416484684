// Refractive index of a catalogue glass from its Sellmeier equation, the basis of the physical prism model.
import { CalibrationError } from "./calibration-error";
import { GLASS_CATALOGUE, type GlassName, type SellmeierGlass } from "./glass-catalogue";
import { refractiveIndexOrNaN } from "./refractive-index-or-nan";
import { assertPositiveFinite } from "../units/assert-positive-finite";

/**
 * n(λ) = sqrt(1 + Σ Bᵢλ²/(λ² − Cᵢ)) with λ in µm.
 * @param glass - a catalogue name or explicit Sellmeier coefficients
 * @param wavelengthNm - wavelength in nm (the formula is stated for vacuum wavelengths; the air/vacuum
 *   difference, ~3e-4 relative, moves n by < 1e-6 for these glasses and is ignored)
 */
export function refractiveIndex(glass: GlassName | SellmeierGlass, wavelengthNm: number): number {
  const coefficients = typeof glass === "string" ? GLASS_CATALOGUE[glass] : glass;
  if (!coefficients) {
    throw new RangeError(`unknown glass "${String(glass)}"`);
  }
  assertPositiveFinite(wavelengthNm, "wavelengthNm");
  const n = refractiveIndexOrNaN(coefficients, wavelengthNm);
  if (Number.isNaN(n)) {
    throw new CalibrationError(
      "not-invertible",
      `${coefficients.name}: ${wavelengthNm} nm lies beyond a Sellmeier resonance of the glass`,
    );
  }
  return n;
}
