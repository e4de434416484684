// A mixed Hg–Ar pencil lamp recorded on a bench instrument. The lines come from the caller's line table
// (the generator's truth is the pixel → λ relation; the table only places the lines).
import type { ReferenceLine } from "../types";
import { pixelCountsCsv } from "./pixel-counts-csv";
import { synthesizeSpectrum } from "./synthesize-spectrum";
import {
  SYNTHETIC_PIXELS,
  SYNTHETIC_RESOLUTION_NM,
  type SyntheticInstrument,
} from "./synthetic-instrument";
import { syntheticLineWidthNm } from "./synthetic-line-width-nm";

/** A mixed Hg–Ar lamp recorded on the instrument, as "pixel,counts" text: the table's Hg I and Ar I lamp lines. */
export function syntheticLampFile(
  instrument: SyntheticInstrument,
  table: readonly ReferenceLine[],
  seed = 3,
): string {
  const lampLines = table.filter(
    (l) =>
      l.flags.lamp &&
      (l.species === "Hg I" || l.species === "Ar I") &&
      l.airNm > 355 &&
      l.airNm < 895,
  );
  const spectrum = synthesizeSpectrum({
    pixelCount: SYNTHETIC_PIXELS,
    wavelengthOfPixel: instrument.wavelengthOfPixel,
    resolutionNm: SYNTHETIC_RESOLUTION_NM,
    lines: lampLines.map((l) => ({
      wavelengthNm: l.airNm,
      amplitude: 150 + 40 * Math.sqrt(l.intensities.lamp ?? 1),
      fwhmNm: syntheticLineWidthNm(instrument, l.airNm),
    })),
    readNoiseCounts: 5,
    shotNoise: true,
    darkCounts: 200,
    seed,
  });
  return pixelCountsCsv(spectrum.y);
}
