// Lines only 2–3 samples wide (a small grating or a prism's slit image) a few widths apart are two
// peaks, not one: a slope read over the smoothing's whole 9-sample window turned once across both.
// And the smoothing's ringing beside a strong narrow line is no second peak.
import { describe, it, expect } from "vitest";
import { findPeaks } from "@/lib/spectrum/peaks";
import { makeRandom } from "@/lib/spectrum/statistics/make-random";

const SIGMA_PER_FWHM = 1 / (2 * Math.sqrt(2 * Math.LN2));
const gaussian = (x: number, centre: number, fwhm: number, height: number) =>
  height * Math.exp(-0.5 * ((x - centre) / (fwhm * SIGMA_PER_FWHM)) ** 2);

/** Counts with Poisson noise over a flat continuum of 200 and read noise of 5. */
function spectrum(lines: { centre: number; fwhm: number; height: number }[], seed: number) {
  const random = makeRandom(seed);
  const n = 1024;
  const x = Float64Array.from({ length: n }, (_, i) => i);
  // A gently rising continuum, so the noise grows with the level and the chain models it.
  const level = (i: number) => 200 + 1.5 * i;
  const y = Float64Array.from(x, (i) => {
    const mean =
      level(i) + lines.reduce((sum, l) => sum + gaussian(i, l.centre, l.fwhm, l.height), 0);
    return random.poisson(mean) + 5 * random.normal();
  });
  return { x, y };
}

describe("peaks of lines a few samples wide", () => {
  it("keeps two lines 2.5 samples wide and 4.8 samples apart (a 2:1 doublet) as two peaks", () => {
    // Shaped like the Na D pair on a grating sampled at 0.125 nm with 0.32 nm resolution.
    let found = 0;
    for (let seed = 1; seed <= 20; seed++) {
      const { x, y } = spectrum(
        [
          { centre: 400.3, fwhm: 2.5, height: 12000 },
          { centre: 405.1, fwhm: 2.5, height: 3500 },
        ],
        seed,
      );
      const near = findPeaks(x, y).filter((p) => p.x > 395 && p.x < 410);
      if (near.length === 2 && Math.abs(near[1].x - 405.1) < 0.5) found++;
    }
    expect(found).toBe(20);
  });

  it("keeps a doublet 2.8 samples wide and 6.3 samples apart as two peaks", () => {
    // Shaped like the K I resonance doublet on a prism's red end.
    for (let seed = 1; seed <= 20; seed++) {
      const { x, y } = spectrum(
        [
          { centre: 600.0, fwhm: 2.8, height: 2800 },
          { centre: 606.3, fwhm: 2.8, height: 2300 },
        ],
        seed,
      );
      const near = findPeaks(x, y).filter((p) => p.x > 595 && p.x < 612);
      expect(near.map((p) => Math.round(p.x))).toEqual([600, 606]);
    }
  });

  it("finds a companion of a third of the height 1.35 FWHM beside a line 2.5 samples wide", () => {
    // Shaped like Na D1 beside D2 at 0.44 nm resolution and 0.18 nm per sample, smoothed with the
    // 7-sample quartic analyzeSample uses for lines this narrow. The companion is a one-sample top on
    // the strong line's falling flank: the smoothed signal's central differences never turn positive
    // there, so a top found only where they change sign was lost (D1 "missing though expected at SNR
    // 383" on the sample sweep). Whether the samples show a top of it at all depends on where the
    // lines fall between samples; at these three phases they do. Measured: 47 of 60 found, none before.
    let found = 0;
    for (const phase of [0.3, 0.5, 0.7]) {
      for (let seed = 1; seed <= 20; seed++) {
        const { x, y } = spectrum(
          [
            { centre: 500 + phase, fwhm: 2.5, height: 19000 },
            { centre: 503.37 + phase, fwhm: 2.5, height: 7000 },
          ],
          seed,
        );
        const near = findPeaks(x, y, { smoothing: { windowSize: 7, polynomial: 4 } }).filter(
          (p) => p.x > 495 && p.x < 510,
        );
        if (near.length === 2 && Math.abs(near[1].x - (503.37 + phase)) < 0.6) found++;
      }
    }
    expect(found).toBeGreaterThanOrEqual(40);
  });

  it("does not take the smoothing's ringing beside a strong narrow line for peaks", () => {
    let extra = 0;
    for (let seed = 1; seed <= 20; seed++) {
      const { x, y } = spectrum([{ centre: 500.2, fwhm: 3, height: 60000 }], seed);
      extra += findPeaks(x, y).filter((p) => p.x > 490 && p.x < 510).length - 1;
    }
    expect(extra).toBe(0);
  });
});
