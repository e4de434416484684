// How wide a line is drawn on a bench instrument: the grating's resolution, or on the prism a slit
// image a few pixels wide.
import {
  SYNTHETIC_PIXELS,
  SYNTHETIC_RESOLUTION_NM,
  type SyntheticInstrument,
} from "./synthetic-instrument";

/** A slit image is a few pixels wide whatever the dispersion (common practice); on a prism the width in
 * nm therefore follows the local dispersion. */
const SLIT_IMAGE_PX = 2.5;

/** FWHM in nm of a line at `wavelengthNm` on the instrument. */
export function syntheticLineWidthNm(
  instrument: Pick<SyntheticInstrument, "dispersion" | "wavelengthOfPixel">,
  wavelengthNm: number,
): number {
  if (instrument.dispersion === "grating") return SYNTHETIC_RESOLUTION_NM;
  // Find the pixel of the line by bisection on the monotonic dispersion relation.
  const { wavelengthOfPixel } = instrument;
  let [lo, hi] = [0, SYNTHETIC_PIXELS - 1];
  const rising = wavelengthOfPixel(hi) > wavelengthOfPixel(lo);
  for (let k = 0; k < 40; k++) {
    const mid = (lo + hi) / 2;
    if (wavelengthOfPixel(mid) < wavelengthNm === rising) lo = mid;
    else hi = mid;
  }
  const px = Math.min(SYNTHETIC_PIXELS - 2, Math.max(1, lo));
  return SLIT_IMAGE_PX * Math.abs(wavelengthOfPixel(px + 0.5) - wavelengthOfPixel(px - 0.5));
}
