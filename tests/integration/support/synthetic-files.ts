// Synthetic lamp and flame files with a known truth, written as two-column "pixel,counts" text the way
// a small spectrometer exports them: a grating with a cubic dispersion and an F2 prism, both imaged on
// 2048 pixels. Lines come from the starter line table (the generator's truth is the pixel → λ relation;
// the table only places the lines), as in tests/unit/spectrum/analysis/full-chain.test.ts.
import fs from "node:fs";
import path from "node:path";
import { parseLineTableCsv, toReferenceLine } from "@/lib/lines";
import {
  prismInverseWavelengths,
  type PrismGeometry,
} from "@/lib/spectrum/calibration/prism-forward";
import { synthesizeSpectrum } from "@/lib/spectrum/synthetic";
import type { DispersionKind, ReferenceLine } from "@/lib/spectrum/types";

export const PIXELS = 2048;
/** Nominal resolution (FWHM) of both instruments in nm: the grating's everywhere, the prism's near its middle. */
export const RESOLUTION_NM = 1;
/** A slit image is a few pixels wide whatever the dispersion (common practice); on a prism the width in
 * nm therefore follows the local dispersion. */
const SLIT_IMAGE_PX = 2.5;

const starterCsv = fs.readFileSync(
  path.resolve(__dirname, "../../../db/lines/starter-lines.csv"),
  "utf8",
);
const table: ReferenceLine[] = parseLineTableCsv(starterCsv).rows.map((row, i) =>
  toReferenceLine(row, `row-${i}`),
);

/** Hg I and Ar I lamp lines of the starter table (a mixed Hg–Ar pencil lamp). */
const lampLines = table.filter(
  (l) =>
    l.flags.lamp &&
    (l.species === "Hg I" || l.species === "Ar I") &&
    l.airNm > 355 &&
    l.airNm < 895,
);

/** The elements drawn into the flame file; everything else in the table is absent from it. */
export const FLAME_SPECIES = ["Na I", "K I", "Li I", "Sr I", "Ca I"];
const flameLines = table.filter(
  (l) => FLAME_SPECIES.includes(l.species) && (l.intensities.flame ?? 0) > 0,
);

export interface SyntheticInstrument {
  dispersion: DispersionKind;
  /** The generator's truth: wavelength in nm at a (fractional) pixel. */
  wavelengthOfPixel: (px: number) => number;
  /** Nominal range to declare for the instrument, nm (the truth's ends rounded to 10 nm). */
  nominalRangeNm: [number, number];
}

function withRange(
  dispersion: DispersionKind,
  wavelengthOfPixel: (px: number) => number,
): SyntheticInstrument {
  const ends = [wavelengthOfPixel(0), wavelengthOfPixel(PIXELS - 1)].sort((a, b) => a - b);
  return {
    dispersion,
    wavelengthOfPixel,
    nominalRangeNm: [Math.round(ends[0] / 10) * 10, Math.round(ends[1] / 10) * 10],
  };
}

/** A grating with a cubic dispersion over 350–900 nm, blue at low pixels. */
export function syntheticGrating(): SyntheticInstrument {
  return withRange("grating", (px) => {
    const u = px / (PIXELS - 1);
    return 350 + 530 * u + 30 * u * u - 10 * u * u * u;
  });
}

/** A 60° F2 prism near minimum deviation, imaged over 2048 pixels (≈ 355–905 nm), blue at low pixels. */
export function syntheticPrism(): SyntheticInstrument {
  const geometry: PrismGeometry = {
    glass: "F2",
    incidenceRad: (52 * Math.PI) / 180,
    apexRad: Math.PI / 3,
    focalX: 16000,
    axisX: 1230,
    direction: 1,
    referenceWavelengthNm: 480,
  };
  const wavelengths = prismInverseWavelengths(
    geometry,
    Float64Array.from({ length: PIXELS }, (_, i) => i),
  );
  return withRange("prism", (px) => {
    const i = Math.min(PIXELS - 2, Math.max(0, Math.floor(px)));
    return wavelengths[i] + (wavelengths[i + 1] - wavelengths[i]) * (px - i);
  });
}

function lineWidthNm(instrument: SyntheticInstrument, wavelengthNm: number): number {
  if (instrument.dispersion === "grating") return RESOLUTION_NM;
  const { wavelengthOfPixel } = instrument;
  let [lo, hi] = [0, PIXELS - 1];
  const rising = wavelengthOfPixel(hi) > wavelengthOfPixel(lo);
  for (let k = 0; k < 40; k++) {
    const mid = (lo + hi) / 2;
    if (wavelengthOfPixel(mid) < wavelengthNm === rising) lo = mid;
    else hi = mid;
  }
  const px = Math.min(PIXELS - 2, Math.max(1, lo));
  return SLIT_IMAGE_PX * Math.abs(wavelengthOfPixel(px + 0.5) - wavelengthOfPixel(px - 0.5));
}

/** The same flame as flameFile, exported on the instrument's own wavelength axis: "wavelength_nm,counts". */
export function flameFileOnWavelengthAxis(instrument: SyntheticInstrument, seed = 11): string {
  const counts = flameFile(instrument, seed)
    .trim()
    .split("\n")
    .slice(1)
    .map((row) => row.split(",")[1]);
  const rows = [
    "wavelength_nm,counts",
    ...counts.map((c, i) => `${instrument.wavelengthOfPixel(i).toFixed(4)},${c}`),
  ];
  return `${rows.join("\n")}\n`;
}

function toPixelCsv(y: Float64Array): string {
  const rows = ["pixel,counts"];
  for (let i = 0; i < y.length; i++) rows.push(`${i},${y[i].toFixed(2)}`);
  return `${rows.join("\n")}\n`;
}

/** A mixed Hg–Ar lamp recorded on the instrument, as "pixel,counts" text. */
export function lampFile(instrument: SyntheticInstrument, seed = 3): string {
  const spectrum = synthesizeSpectrum({
    pixelCount: PIXELS,
    wavelengthOfPixel: instrument.wavelengthOfPixel,
    resolutionNm: RESOLUTION_NM,
    lines: lampLines.map((l) => ({
      wavelengthNm: l.airNm,
      amplitude: 150 + 40 * Math.sqrt(l.intensities.lamp ?? 1),
      fwhmNm: lineWidthNm(instrument, l.airNm),
    })),
    readNoiseCounts: 5,
    shotNoise: true,
    darkCounts: 200,
    seed,
  });
  return toPixelCsv(spectrum.y);
}

/** A flame of Na, K, Li, Sr and Ca salts on a 2200 K continuum, recorded on the instrument, as "pixel,counts" text. */
export function flameFile(instrument: SyntheticInstrument, seed = 11): string {
  const spectrum = synthesizeSpectrum({
    pixelCount: PIXELS,
    wavelengthOfPixel: instrument.wavelengthOfPixel,
    resolutionNm: RESOLUTION_NM,
    lines: flameLines.map((l) => ({
      wavelengthNm: l.airNm,
      amplitude: 3 * (l.intensities.flame ?? 0),
      fwhmNm: lineWidthNm(instrument, l.airNm),
    })),
    continuum: { shape: "planck", temperatureK: 2200, peakCounts: 800 },
    readNoiseCounts: 6,
    shotNoise: true,
    darkCounts: 200,
    seed,
  });
  return toPixelCsv(spectrum.y);
}

/** A "lamp" file with no lines at all (dark level and noise only): nothing to pair. */
export function darkFile(seed = 5): string {
  const spectrum = synthesizeSpectrum({
    pixelCount: PIXELS,
    wavelengthOfPixel: syntheticGrating().wavelengthOfPixel,
    readNoiseCounts: 5,
    darkCounts: 200,
    seed,
  });
  return toPixelCsv(spectrum.y);
}
