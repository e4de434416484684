// A lamp line with an unlisted neighbour too close to be resolved: the peak finder's centre is pulled
// towards the neighbour, and the centre uncertainty pairing gives the peak must cover that pull, while
// clean lines keep a small one.
import { describe, expect, it } from "vitest";
import {
  withBlendUncertainty,
  withCentreFloor,
} from "@/lib/spectrum/calibration/centre-uncertainty";
import { findPeaks } from "@/lib/spectrum/peaks/find-peaks";
import { makeRandom } from "@/lib/spectrum/statistics/make-random";
import { gaussian } from "./synthetic-lamp";

const PIXELS = 1024;
const FWHM = 5;
const SIGMA = FWHM / (2 * Math.sqrt(2 * Math.LN2));
/** Clean lines every 50 px; the one at LISTED_X has an unlisted neighbour. */
const CLEAN = Array.from({ length: 18 }, (_, i) => 60 + 50 * i);
const LISTED_X = 510.3;

/** A noisy lamp: clean lines of height 2000 and, at LISTED_X, one with a neighbour of `share` of its light `separation` px to the red. */
function lamp(share: number, separation: number, seed: number) {
  const random = makeRandom(seed).uniform;
  const x = Float64Array.from({ length: PIXELS }, (_, i) => i);
  const y = new Float64Array(PIXELS);
  const profile = (centre: number, height: number) => {
    for (let i = 0; i < PIXELS; i++) y[i] += height * Math.exp(-0.5 * ((i - centre) / SIGMA) ** 2);
  };
  for (const centre of CLEAN) if (centre !== 510) profile(centre, 2000);
  profile(LISTED_X, 2000 * (1 - share));
  profile(LISTED_X + separation, 2000 * share);
  for (let i = 0; i < PIXELS; i++) y[i] += 100 + Math.sqrt(y[i] + 100) * gaussian(random);
  return { x, y };
}

function centres(share: number, separation: number, seed: number) {
  const { x, y } = lamp(share, separation, seed);
  const peaks = withBlendUncertainty(findPeaks(x, y, { source: "lamp", minSnr: 8 }));
  const nearest = (target: number) =>
    peaks.reduce((best, p) => (Math.abs(p.x - target) < Math.abs(best.x - target) ? p : best));
  const clean = CLEAN.filter((c) => Math.abs(c - 510) > 100).map(nearest);
  return { blended: nearest(LISTED_X), clean };
}

describe("centre uncertainty of a lamp peak pulled by an unresolved neighbour", () => {
  // The centroid of two Gaussians moves by p·d towards the weaker one (p its share, d the separation):
  // a standard result; a fit peak's centre moves by about as much.
  it.each([
    [0.15, 3],
    [0.2, 3.5],
    [0.25, 2.5],
  ])("covers the pull of a neighbour with %s of the light %s px away", (share, separation) => {
    for (const seed of [1, 2, 3]) {
      const { blended, clean } = centres(share, separation, seed);
      const pull = blended.x - LISTED_X;
      // The peak is pulled towards the neighbour, by a share of p·d (a centre taken from the top of
      // the profile moves less than the centroid) …
      expect(pull).toBeGreaterThan(0.2 * share * separation);
      // … and its σ says so: the pull lies within two of them, …
      expect(Math.abs(pull)).toBeLessThanOrEqual(2 * blended.xUncertainty!);
      // … larger than any clean line's, so a fit weighs it down instead of following it.
      const cleanSigmas = clean.map((p) => p.xUncertainty ?? Number.NaN).sort((a, b) => a - b);
      expect(blended.xUncertainty!).toBeGreaterThan(cleanSigmas[cleanSigmas.length - 1]);
      expect(blended.xUncertainty!).toBeGreaterThan(2 * cleanSigmas[cleanSigmas.length >> 1]);
    }
  });

  it("leaves clean lines their small uncertainty (noise and a floor of 3 % of the width)", () => {
    const { clean } = centres(0.2, 3, 4);
    for (const p of clean) {
      expect(p.xUncertainty ?? Number.NaN).toBeLessThan(0.1 * FWHM);
      // Their centres are where the σ says.
      expect(Math.abs(p.x - Math.round(p.x / 10) * 10)).toBeLessThan(
        4 * (p.xUncertainty ?? Number.NaN),
      );
    }
  });

  it("gives every centre the floor alone where the draws weigh them (no allowance for a blend)", () => {
    const { x, y } = lamp(0.25, 2.5, 5);
    const found = findPeaks(x, y, { source: "lamp", minSnr: 8 });
    const floored = withCentreFloor(found);
    const blendAware = withBlendUncertainty(found);
    const widths = found.map((p) => p.fwhm!).sort((a, b) => a - b);
    found.forEach((peak, i) => {
      const sigma = floored[i].xUncertainty!;
      // Never below 3 % of the neighbours' typical width, whatever the finder's noise σ says …
      expect(sigma).toBeGreaterThanOrEqual(0.03 * widths[0] * 0.999);
      expect(sigma).toBeGreaterThanOrEqual(peak.xUncertainty ?? 0);
      // … and never more than the finder's σ and that floor together.
      expect(sigma).toBeLessThanOrEqual(
        Math.hypot(peak.xUncertainty ?? 0, 0.03 * widths[widths.length - 1]) * 1.001,
      );
      expect(sigma).toBeLessThanOrEqual(blendAware[i].xUncertainty! * 1.000001);
    });
    // The blended peak keeps the floor's small σ here, where the blend-aware weighting widens it.
    const k = found.reduce(
      (best, p, i) => (Math.abs(p.x - LISTED_X) < Math.abs(found[best].x - LISTED_X) ? i : best),
      0,
    );
    expect(blendAware[k].xUncertainty!).toBeGreaterThan(2 * floored[k].xUncertainty!);
  });
});
