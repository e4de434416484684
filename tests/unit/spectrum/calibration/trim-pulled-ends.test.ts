// An automatic calibration claims its ends only where more than one pair stands behind them: an end
// pair pulled by a tenth of a line width is set aside (the covered range ends at the next pair), a
// well-centred one is kept, and a lone pair far beyond the rest, which nothing can check, is set aside.
import { describe, expect, it } from "vitest";
import { fitCalibration, type LampPair } from "@/lib/spectrum/calibration";
import { trimPulledEnds } from "@/lib/spectrum/calibration/trim-pulled-ends";
import { makeRandom } from "@/lib/spectrum/statistics/make-random";

/** Lines FWHM_X wide on a 2048-pixel array whose axis is a gently curved cubic (as the fit's own family). */
const FWHM_X = 5;
const DOMAIN: [number, number] = [0, 2047];
const nmAt = (x: number) => 400 + 0.19 * x + 6e-6 * x * x - 1.5e-9 * x * x * x;
const xOf = (nm: number) => {
  let [low, high] = DOMAIN;
  for (let k = 0; k < 60; k++) {
    const middle = 0.5 * (low + high);
    if (nmAt(middle) < nm) low = middle;
    else high = middle;
  }
  return 0.5 * (low + high);
};

function pairsAt(wavelengths: number[], seed: number): LampPair[] {
  const random = makeRandom(seed).uniform;
  return wavelengths.map((wavelengthNm, i) => ({
    // Centres good to about a hundredth of the line width.
    x: xOf(wavelengthNm) + 0.05 * (random() - 0.5),
    xUncertainty: 0.03,
    wavelengthNm,
    peakIndex: i,
    lineIndex: i,
  }));
}

const evenly = (n: number) => Array.from({ length: n }, (_, i) => 405 + (390 * i) / (n - 1));
const cubicOf = (pairs: LampPair[]) =>
  fitCalibration(pairs, { model: "polynomial", degree: 3, domain: DOMAIN, rejectOutliers: false });

describe("trimPulledEnds", () => {
  it("keeps both ends when every pair is well centred", () => {
    const pairs = pairsAt(evenly(14), 1);
    const trimmed = trimPulledEnds(pairs, cubicOf(pairs), DOMAIN, FWHM_X);
    expect(trimmed.trimmed).toEqual([]);
    expect(trimmed.pairs).toHaveLength(14);
  });

  it("sets aside an end pair pulled by a fifth of a line width, and the range ends at the next pair", () => {
    const pairs = pairsAt(evenly(14), 2);
    const last = pairs.length - 1;
    pairs[last] = { ...pairs[last], x: pairs[last].x + 0.2 * FWHM_X };
    const trimmed = trimPulledEnds(pairs, cubicOf(pairs), DOMAIN, FWHM_X);
    expect(trimmed.trimmed.map((p) => p.peakIndex)).toEqual([last]);
    expect(trimmed.fit.model.coveredX[1]).toBeCloseTo(pairs[last - 1].x, 6);
    expect(trimmed.fit.model.coveredX[0]).toBeCloseTo(pairs[0].x, 6);
  });

  it("sets aside a lone pair far beyond the others, which nothing can check", () => {
    // Thirteen lines in 405–600 nm and one at 795 nm: the cubic there is that pair's alone.
    const pairs = pairsAt([...Array.from({ length: 13 }, (_, i) => 405 + 15 * i), 795], 3);
    const trimmed = trimPulledEnds(pairs, cubicOf(pairs), DOMAIN, FWHM_X);
    expect(trimmed.trimmed.map((p) => p.wavelengthNm)).toEqual([795]);
  });

  it("still sets aside a far end pair that is clearly wrong, wherever the end then rests", () => {
    const pairs = pairsAt(
      [...Array.from({ length: 10 }, (_, i) => 405 + 15 * i), 650, 720, 795],
      6,
    );
    pairs[11] = { ...pairs[11], x: pairs[11].x + 0.125 * FWHM_X };
    pairs[10] = { ...pairs[10], x: pairs[10].x - 0.125 * FWHM_X };
    // 795 nm paired with a peak two line widths away.
    pairs[12] = { ...pairs[12], x: pairs[12].x + 2 * FWHM_X };
    const trimmed = trimPulledEnds(pairs, cubicOf(pairs), DOMAIN, FWHM_X);
    expect(trimmed.trimmed.map((p) => p.wavelengthNm)).toContain(795);
  });

  it("leaves a short pairing alone", () => {
    const pairs = pairsAt(evenly(8), 4);
    pairs[7] = { ...pairs[7], x: pairs[7].x + FWHM_X };
    expect(trimPulledEnds(pairs, cubicOf(pairs), DOMAIN, FWHM_X).trimmed).toEqual([]);
  });
});
