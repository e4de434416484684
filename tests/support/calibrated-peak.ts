// A peak on the calibrated axis for tests that hand identification their own peaks: centred on
// `wavelengthNm` (x is the wavelength), height 10 × SNR, area height × FWHM, clean (not saturated,
// not blended) unless `extra` says otherwise.
import type { CalibratedPeak } from "@/lib/spectrum/types";

export function calibratedPeak(
  wavelengthNm: number,
  snr: number,
  widths: { fwhmNm: number; uncertaintyNm: number; resolutionNm?: number },
  extra: Partial<CalibratedPeak> = {},
): CalibratedPeak {
  const { fwhmNm, uncertaintyNm, resolutionNm } = widths;
  return {
    index: Math.round(wavelengthNm),
    x: wavelengthNm,
    xUncertainty: uncertaintyNm,
    height: 10 * snr,
    fwhm: fwhmNm,
    area: 10 * snr * fwhmNm,
    snr,
    saturated: false,
    blended: false,
    wavelengthNm,
    wavelengthUncertaintyNm: uncertaintyNm,
    fwhmNm,
    ...(resolutionNm !== undefined ? { resolutionNm } : {}),
    ...extra,
  };
}
