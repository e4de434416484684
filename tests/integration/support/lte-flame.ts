// A synthetic flame of calcium in local thermodynamic equilibrium at a temperature the generator knows,
// recorded on one of the synthetic instruments as "pixel,counts" text: for the Boltzmann temperature.
import fs from "node:fs";
import path from "node:path";
import { parseLineTableCsv, toReferenceLine } from "@/lib/lines";
import { synthesizeSpectrum } from "@/lib/spectrum/synthetic";
import type { ReferenceLine } from "@/lib/spectrum/types";
import {
  SYNTHETIC_PIXELS,
  SYNTHETIC_RESOLUTION_NM,
  type SyntheticInstrument,
} from "@/lib/spectrum/synthetic/synthetic-instrument";

// CODATA 2018 value of the Boltzmann constant in eV/K.
const K_EV = 8.617333262e-5;
/** The flame's excitation temperature: a hot (nitrous oxide–acetylene) flame reaches about 3000 K (common practice). */
export const LTE_FLAME_TEMPERATURE_K = 3000;
const TRUE_T = LTE_FLAME_TEMPERATURE_K;

const starterCsv = fs.readFileSync(
  path.resolve(__dirname, "../../../db/lines/starter-lines.csv"),
  "utf8",
);
const table: ReferenceLine[] = parseLineTableCsv(starterCsv).rows.map((row, i) =>
  toReferenceLine(row, `row-${i}`),
);

function pixelOf(grating: SyntheticInstrument, nm: number): number {
  let [lo, hi] = [0, SYNTHETIC_PIXELS - 1];
  for (let k = 0; k < 50; k++) {
    const mid = (lo + hi) / 2;
    if (grating.wavelengthOfPixel(mid) < nm) lo = mid;
    else hi = mid;
  }
  return lo;
}

/**
 * A flame of calcium in LTE at TRUE_T: every Ca I line of the starter table with g, A and an upper
 * energy, each emitting a power ∝ g·A/λ·exp(−E/kT) (Boltzmann population of the upper level, photon
 * energy ∝ 1/λ), drawn so that its total counts follow that power (the height scales with the local
 * nm per pixel, the line being SYNTHETIC_RESOLUTION_NM wide), on a 2200 K continuum with read and shot noise.
 */
export function lteCalciumFlame(grating: SyntheticInstrument): string {
  const [lowNm, highNm] = [
    grating.wavelengthOfPixel(5),
    grating.wavelengthOfPixel(SYNTHETIC_PIXELS - 6),
  ];
  const lines = table.filter(
    (l) =>
      l.species === "Ca I" &&
      l.g &&
      l.a &&
      l.upperEv !== undefined &&
      l.airNm > lowNm &&
      l.airNm < highNm,
  );
  const power = lines.map(
    (l) => ((l.g! * l.a!) / l.airNm) * Math.exp(-l.upperEv! / (K_EV * TRUE_T)),
  );
  const strongest = Math.max(...power);
  const spectrum = synthesizeSpectrum({
    pixelCount: SYNTHETIC_PIXELS,
    wavelengthOfPixel: grating.wavelengthOfPixel,
    resolutionNm: SYNTHETIC_RESOLUTION_NM,
    lines: lines.map((l, i) => {
      const px = pixelOf(grating, l.airNm);
      const nmPerPx = grating.wavelengthOfPixel(px + 0.5) - grating.wavelengthOfPixel(px - 0.5);
      return {
        wavelengthNm: l.airNm,
        amplitude: (400_000 * power[i] * nmPerPx) / strongest / 0.27,
      };
    }),
    continuum: { shape: "planck", temperatureK: 2200, peakCounts: 800 },
    readNoiseCounts: 6,
    shotNoise: true,
    darkCounts: 200,
    seed: 17,
  });
  const rows = ["pixel,counts"];
  for (let i = 0; i < spectrum.y.length; i++) rows.push(`${i},${spectrum.y[i].toFixed(2)}`);
  return `${rows.join("\n")}\n`;
}
