// A flame of Na, K, Li, Sr and Ca salts recorded on a bench instrument. The lines come from the
// caller's line table; everything else in the table is absent from the flame.
import type { ReferenceLine } from "../types";
import { pixelCountsCsv } from "./pixel-counts-csv";
import { synthesizeSpectrum } from "./synthesize-spectrum";
import {
  SYNTHETIC_PIXELS,
  SYNTHETIC_RESOLUTION_NM,
  type SyntheticInstrument,
} from "./synthetic-instrument";
import { syntheticLineWidthNm } from "./synthetic-line-width-nm";

/** The elements drawn into the flame file; everything else in the table is absent from it. */
const FLAME_SPECIES = ["Na I", "K I", "Li I", "Sr I", "Ca I"];

/** A flame of Na, K, Li, Sr and Ca salts on a 2200 K continuum, recorded on the instrument, as "pixel,counts" text. */
export function syntheticFlameFile(
  instrument: SyntheticInstrument,
  table: readonly ReferenceLine[],
  seed = 11,
): string {
  const flameLines = table.filter(
    (l) => FLAME_SPECIES.includes(l.species) && (l.intensities.flame ?? 0) > 0,
  );
  const spectrum = synthesizeSpectrum({
    pixelCount: SYNTHETIC_PIXELS,
    wavelengthOfPixel: instrument.wavelengthOfPixel,
    resolutionNm: SYNTHETIC_RESOLUTION_NM,
    lines: flameLines.map((l) => ({
      wavelengthNm: l.airNm,
      amplitude: 3 * (l.intensities.flame ?? 0),
      fwhmNm: syntheticLineWidthNm(instrument, l.airNm),
    })),
    continuum: { shape: "planck", temperatureK: 2200, peakCounts: 800 },
    readNoiseCounts: 6,
    shotNoise: true,
    darkCounts: 200,
    seed,
  });
  return pixelCountsCsv(spectrum.y);
}
