// Synthetic lamp spectra for the calibration tests: peaks placed by a known dispersion relation, with
// position noise, missing lines and spurious peaks, so pairing and fitting can be checked against truth.
import type { LampLine, LampPeak } from "@/lib/spectrum/calibration";
import { makeRandom } from "@/lib/spectrum/statistics/make-random";

export interface SyntheticLamp {
  peaks: LampPeak[];
  /** For each peak, the index of the line it was made from, or −1 for a spurious peak. */
  truthLine: number[];
}

/** Standard normal deviate by Box–Muller from a uniform generator. */
export function gaussian(random: () => number): number {
  const u = Math.max(random(), 1e-12);
  return Math.sqrt(-2 * Math.log(u)) * Math.cos(2 * Math.PI * random());
}

export function syntheticLamp(
  lines: LampLine[],
  xOfWavelength: (wavelengthNm: number) => number,
  settings: {
    domain: [number, number];
    noiseX: number;
    dropFraction: number;
    spurious: number;
    seed: number;
    maxPeaks?: number;
    /** Lines closer than this (x units) blend into one peak; the weaker one is not seen. Default 4. */
    blendX?: number;
  },
): SyntheticLamp {
  const random = makeRandom(settings.seed).uniform;
  const peaks: LampPeak[] = [];
  const truthLine: number[] = [];
  const onArray = lines
    .map((line, index) => ({ line, index, x: xOfWavelength(line.wavelengthNm) }))
    .filter((c) => c.x >= settings.domain[0] && c.x <= settings.domain[1])
    .sort((a, b) => b.line.intensity - a.line.intensity);
  const blendX = settings.blendX ?? 4;
  const resolved = onArray
    .filter((c, k) => onArray.slice(0, k).every((stronger) => Math.abs(stronger.x - c.x) >= blendX))
    .slice(0, settings.maxPeaks ?? Infinity);
  for (const c of resolved) {
    if (random() < settings.dropFraction) continue;
    // Heights follow the table's intensities loosely (a factor of ~2 scatter), as real lamps do.
    peaks.push({
      x: c.x + settings.noiseX * gaussian(random),
      xUncertainty: settings.noiseX,
      height: c.line.intensity * (0.5 + random()),
    });
    truthLine.push(c.index);
  }
  const maxHeight = Math.max(...peaks.map((p) => p.height));
  for (let k = 0; k < settings.spurious; k++) {
    const x = settings.domain[0] + random() * (settings.domain[1] - settings.domain[0]);
    peaks.push({ x, xUncertainty: settings.noiseX, height: maxHeight * 0.3 * random() });
    truthLine.push(-1);
  }
  return { peaks, truthLine };
}
