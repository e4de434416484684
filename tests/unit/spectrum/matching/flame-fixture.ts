// Builds the synthetic flame spectra and their detected peaks shared by the scoring tests.
import { synthesizeSpectrum } from "../../../../lib/spectrum/synthetic";
import type { CalibratedPeak, ReferenceLine } from "../../../../lib/spectrum/types";
import { detectTestPeaks } from "./detect-test-peaks";
import { flameEmission, flameLineTable } from "./flame-line-table";

export const FLAME_RANGE_NM: [number, number] = [380, 780];
export const FLAME_RESOLUTION_NM = 1;

/** A grating axis from 380 to 780 nm over 2048 pixels with a slight cubic term. */
export function gratingAxis(px: number): number {
  const t = px / 2047;
  return 380 + 400 * t + 1.5 * t * (1 - t) * (t - 0.5);
}

export interface FlameRun {
  table: ReferenceLine[];
  peaks: CalibratedPeak[];
}

/** Counts at each species' strongest line; the rest follow the table's flame intensities. */
export function flameRun(countsBySpecies: Record<string, number>, seed = 1): FlameRun {
  const table = flameLineTable();
  const { lines, bands } = flameEmission(table, countsBySpecies);
  const spectrum = synthesizeSpectrum({
    pixelCount: 2048,
    wavelengthOfPixel: gratingAxis,
    resolutionNm: FLAME_RESOLUTION_NM,
    lines,
    bands,
    continuum: { shape: "planck", temperatureK: 2200, peakCounts: 800 },
    shotNoise: true,
    readNoiseCounts: 10,
    darkCounts: 500,
    saturationCounts: 65535,
    seed,
  });
  const peaks = detectTestPeaks(spectrum.y, {
    wavelengthNmAtPixel: spectrum.truth.wavelengthNmAtPixel,
    saturationCounts: 65535,
    seed: seed + 100,
  });
  return { table, peaks };
}
