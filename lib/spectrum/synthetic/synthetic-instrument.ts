// The two invented bench instruments of the demo data and the integration tests, with their known
// truth: a grating with a cubic dispersion and an F2 prism, both imaged on 2048 pixels.
import type { DispersionKind } from "../types";

export const SYNTHETIC_PIXELS = 2048;
/** Nominal resolution (FWHM) of both instruments in nm: the grating's everywhere, the prism's near its middle. */
export const SYNTHETIC_RESOLUTION_NM = 1;

export interface SyntheticInstrument {
  dispersion: DispersionKind;
  /** The generator's truth: wavelength in nm at a (fractional) pixel. */
  wavelengthOfPixel: (px: number) => number;
  /** Nominal range to declare for the instrument, nm (the truth's ends rounded to 10 nm). */
  nominalRangeNm: [number, number];
}

/** The instrument of a dispersion and its truth, with the nominal range read from the truth's ends. */
export function syntheticInstrument(
  dispersion: DispersionKind,
  wavelengthOfPixel: (px: number) => number,
): SyntheticInstrument {
  const ends = [wavelengthOfPixel(0), wavelengthOfPixel(SYNTHETIC_PIXELS - 1)].sort(
    (a, b) => a - b,
  );
  return {
    dispersion,
    wavelengthOfPixel,
    nominalRangeNm: [Math.round(ends[0] / 10) * 10, Math.round(ends[1] / 10) * 10],
  };
}
