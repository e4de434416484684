// Peak finding on synthetic spectra of known truth: centres, widths, heights, areas, flags and honesty.
import { describe, it, expect } from "vitest";
import { findPeaks, pickPeaks } from "@/lib/spectrum/peaks";
import { prepareSignal } from "@/lib/spectrum/signal";
import { makeRandom } from "@/lib/spectrum/statistics/make-random";

const GAUSS_SIGMA_PER_FWHM = 1 / (2 * Math.sqrt(2 * Math.LN2));
const gaussian = (x: number, centre: number, fwhm: number, height: number) =>
  height * Math.exp(-0.5 * ((x - centre) / (fwhm * GAUSS_SIGMA_PER_FWHM)) ** 2);
const lorentzian = (x: number, centre: number, fwhm: number, height: number) =>
  height / (1 + ((x - centre) / (fwhm / 2)) ** 2);
const pixels = (n: number) => Float64Array.from({ length: n }, (_, i) => i);
const nearest = <T extends { x: number }>(peaks: T[], x: number) =>
  peaks.reduce((best, p) => (Math.abs(p.x - x) < Math.abs(best.x - x) ? p : best));

describe("findPeaks on a flame-like spectrum (curved continuum, seeded noise σ = 2)", () => {
  const n = 2048;
  const x = pixels(n);
  const { normal } = makeRandom(2024);
  const truth = [
    { centre: 310.37, fwhm: 6, height: 400, shape: gaussian },
    { centre: 905.81, fwhm: 8, height: 120, shape: gaussian },
    { centre: 1502.2, fwhm: 10, height: 300, shape: lorentzian },
  ];
  const continuum = (i: number) => 500 + 0.2 * i + 150 * Math.sin(i / 700);
  const y = Float64Array.from(
    { length: n },
    (_, i) =>
      continuum(i) +
      truth.reduce((s, t) => s + t.shape(i, t.centre, t.fwhm, t.height), 0) +
      2 * normal(),
  );
  const peaks = findPeaks(x, y);

  it("finds exactly the three lines, sorted, none flagged", () => {
    expect(peaks.map((p) => Math.round(p.x))).toEqual([310, 906, 1502]);
    expect(peaks.every((p) => !p.blended && !p.saturated)).toBe(true);
  });

  it("recovers centres within 4σ, Gaussian FWHM within 4 %, Lorentzian within 10 %, heights within 5 %", () => {
    for (const t of truth) {
      const p = nearest(peaks, t.centre);
      expect(Math.abs(p.x - t.centre)).toBeLessThan(4 * p.xUncertainty);
      expect(Math.abs(p.fwhm / t.fwhm - 1)).toBeLessThan(t.shape === gaussian ? 0.04 : 0.1);
      expect(Math.abs(p.height / t.height - 1)).toBeLessThan(0.05);
      // SNR is height over the per-sample noise σ = 2 (within 10 %: estimated noise and height).
      expect(Math.abs(p.snr / (t.height / 2) - 1)).toBeLessThan(0.1);
    }
  });

  it("recovers a Gaussian's area (height · FWHM · √(π / ln 16)) within 4 %", () => {
    const t = truth[0];
    const area = t.height * t.fwhm * Math.sqrt(Math.PI / Math.log(16));
    expect(Math.abs(nearest(peaks, t.centre).area / area - 1)).toBeLessThan(0.04);
  });

  it("is pickPeaks composed with prepareSignal", () => {
    expect(pickPeaks(x, prepareSignal(x, y))).toEqual(peaks);
  });
});

describe("centre uncertainty", () => {
  it("is honest: about 68 % of centres fall within 1σ over 400 noisy trials (tolerance ±0.08)", () => {
    const n = 256;
    const x = pixels(n);
    for (const [fwhm, height, shape] of [
      [6, 30, gaussian],
      [4, 15, gaussian],
      [6, 30, lorentzian],
    ] as const) {
      const { uniform, normal } = makeRandom(100 + fwhm);
      let inside = 0;
      for (let trial = 0; trial < 400; trial++) {
        const centre = 120 + 10 * uniform();
        const y = Float64Array.from(
          { length: n },
          (_, i) => 50 + 0.1 * i + shape(i, centre, fwhm, height) + normal(),
        );
        const p = nearest(findPeaks(x, y), centre);
        if (Math.abs(p.x - centre) <= p.xUncertainty) inside++;
      }
      // 0.6827 is the normal distribution's 1σ coverage; ±0.08 is about 3.4 binomial standard errors at 400 trials.
      expect(Math.abs(inside / 400 - 0.6827)).toBeLessThan(0.08);
    }
  });

  it("grows with noise and with width", () => {
    const n = 512;
    const x = pixels(n);
    const measure = (fwhm: number, sigma: number) => {
      const { normal } = makeRandom(77);
      const y = Float64Array.from(
        { length: n },
        (_, i) => gaussian(i, 250.3, fwhm, 200) + sigma * normal(),
      );
      return nearest(findPeaks(x, y), 250.3).xUncertainty;
    };
    expect(measure(6, 4)).toBeGreaterThan(1.5 * measure(6, 2));
    expect(measure(16, 2)).toBeGreaterThan(1.2 * measure(6, 2));
  });
});

describe("flags", () => {
  const n = 512;
  const x = pixels(n);

  it("flags a doublet 0.85 FWHM apart (2 : 1) as blended, and an isolated line as not", () => {
    const { normal } = makeRandom(8);
    const y = Float64Array.from(
      { length: n },
      (_, i) =>
        100 +
        gaussian(i, 200, 7, 300) +
        gaussian(i, 206, 7, 150) +
        gaussian(i, 400, 7, 300) +
        2 * normal(),
    );
    const peaks = findPeaks(x, y);
    expect(nearest(peaks, 201).blended).toBe(true);
    expect(nearest(peaks, 400).blended).toBe(false);
  });

  it("flags a clipped top as saturated, keeps it in the list and centres it within 0.3 px", () => {
    const { normal } = makeRandom(9);
    const y = Float64Array.from({ length: n }, (_, i) =>
      Math.min(4095, 100 + gaussian(i, 250.4, 8, 12000) + 3 * normal()),
    );
    const peaks = findPeaks(x, y, { detectorMax: 4095 });
    const p = nearest(peaks, 250.4);
    expect(p.saturated).toBe(true);
    expect(Math.abs(p.x - 250.4)).toBeLessThan(0.3);
    expect(p.height).toBeLessThan(4095);
    // The same flat top is found without detectorMax (a run of ≥ 3 samples at the array maximum).
    expect(nearest(findPeaks(x, y), 250.4).saturated).toBe(true);
  });

  it("finds a narrow line clipped over several samples once, with no smoothing lobes beside it", () => {
    // A lamp's strongest line: 4.5 px wide, 6× over full scale, so 7 samples sit at the clip level.
    // The smoothing used to ring at the plateau's corners (two tops at one centre) and beside it.
    const { normal } = makeRandom(11);
    const y = Float64Array.from({ length: n }, (_, i) =>
      Math.min(9603, 230 + gaussian(i, 302.3, 4.5, 60000) + 5 * normal()),
    );
    const peaks = findPeaks(x, y).filter((p) => Math.abs(p.x - 302.3) < 20);
    expect(peaks).toHaveLength(1);
    expect(peaks[0].saturated).toBe(true);
    expect(Math.abs(peaks[0].x - 302.3)).toBeLessThan(0.3);
  });

  it("rejects decreasing x with a RangeError", () => {
    const y = Float64Array.from({ length: n }, (_, i) => gaussian(i, 250, 6, 100));
    expect(() => findPeaks(x.slice().reverse(), y)).toThrow(RangeError);
    expect(() => findPeaks(x, y, { minSnr: -1 })).toThrow(RangeError);
  });
});

describe("non-uniform wavelength axis", () => {
  it("reports centre and FWHM in nm on a prism-like axis (dispersion varying 3× across the array)", () => {
    const n = 1024;
    const x = Float64Array.from({ length: n }, (_, i) => 400 + 0.1 * i + 1e-4 * i * i);
    const { normal } = makeRandom(12);
    const lines = [
      { nm: 450.5, fwhmNm: 1.2 },
      { nm: 560.3, fwhmNm: 2.0 },
    ];
    const y = Float64Array.from(
      { length: n },
      (_, i) => 20 + lines.reduce((s, l) => s + gaussian(x[i], l.nm, l.fwhmNm, 500), 0) + normal(),
    );
    const peaks = findPeaks(x, y);
    expect(peaks.length).toBe(2);
    for (const l of lines) {
      const p = nearest(peaks, l.nm);
      expect(Math.abs(p.x - l.nm)).toBeLessThan(4 * p.xUncertainty);
      expect(Math.abs(p.fwhm / l.fwhmNm - 1)).toBeLessThan(0.05);
    }
  });
});
