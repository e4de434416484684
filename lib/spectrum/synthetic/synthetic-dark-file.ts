// A "lamp" recording with no lines at all, on the bench grating.
import { pixelCountsCsv } from "./pixel-counts-csv";
import { synthesizeSpectrum } from "./synthesize-spectrum";
import { syntheticGrating } from "./synthetic-grating";
import { SYNTHETIC_PIXELS } from "./synthetic-instrument";

/** A "lamp" file with no lines at all (dark level and noise only): nothing to pair. */
export function syntheticDarkFile(seed = 5): string {
  const spectrum = synthesizeSpectrum({
    pixelCount: SYNTHETIC_PIXELS,
    wavelengthOfPixel: syntheticGrating().wavelengthOfPixel,
    readNoiseCounts: 5,
    darkCounts: 200,
    seed,
  });
  return pixelCountsCsv(spectrum.y);
}
