// A whole spectrum put on a nm axis, kept strictly increasing (a wavenumber spectrum is reversed).
import type { Spectrum, WavelengthMedium } from "../types";
import type { AirVacuumOptions } from "./air-vacuum-options";
import { toNanometres } from "./to-nanometres";

export interface SpectrumToNanometresOptions extends AirVacuumOptions {
  /**
   * Medium of the result. Left out, the spectrum stays in its own medium (vacuum for wavenumbers).
   * @default the spectrum's medium
   */
  medium?: WavelengthMedium;
}

/** A new Spectrum with x in nm (increasing) and `medium` set; `spectrum` is not modified. */
export function spectrumToNanometres(
  spectrum: Spectrum,
  options: SpectrumToNanometresOptions = {},
): Spectrum {
  const { medium, belowRange } = options;
  const xNm = toNanometres(spectrum.x, {
    unit: spectrum.xUnit,
    inputMedium: spectrum.medium,
    medium,
    belowRange,
  });
  const y = Float64Array.from(spectrum.y);
  const resultMedium = medium ?? (spectrum.xUnit === "wavenumber" ? "vacuum" : spectrum.medium);
  if (xNm.length > 1 && xNm[0] > xNm[xNm.length - 1]) {
    xNm.reverse();
    y.reverse();
  }
  return { x: xNm, y, xUnit: "nm", medium: resultMedium, meta: { ...spectrum.meta } };
}
