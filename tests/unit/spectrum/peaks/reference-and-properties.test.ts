// Peaks against SciPy's find_peaks/peak_widths, the stages' own exact cases, and fast-check properties.
import { describe, it, expect } from "vitest";
import fc from "fast-check";
import reference from "../../../reference/signal-reference.json";
import {
  countCurvatureMinima,
  findPeaks,
  fitPeakTop,
  gaussianCentreBound,
  halfHeightCrossings,
} from "@/lib/spectrum/peaks";

describe("against SciPy find_peaks (rel_height 0.5) on the stored spectrum", () => {
  const ref = reference.findPeaks;
  const y = Float64Array.from(ref.spectrum);
  const x = Float64Array.from(y, (_, i) => i);
  const peaks = findPeaks(x, y, { smoothing: false, baseline: { method: "none" } });

  it("finds the same peaks at the same samples", () => {
    // SciPy 1.10.1 find_peaks peak indices, tests/reference/signal-reference.json
    expect(peaks.map((p) => p.index)).toEqual(ref.peaks);
  });

  it("interpolates half-height crossings exactly as peak_widths does, and agrees on width and height", () => {
    ref.peaks.forEach((index, k) => {
      const level = ref.peakHeights[k] - ref.prominences[k] / 2;
      const { left, right } = halfHeightCrossings(y, {
        index,
        level,
        leftLimit: 0,
        rightLimit: y.length - 1,
      });
      // SciPy 1.10.1 peak_widths left_ips/right_ips, tests/reference/signal-reference.json
      expect(left).toBeCloseTo(ref.leftIps[k], 9);
      expect(right).toBeCloseTo(ref.rightIps[k], 9);
      // SciPy 1.10.1 widths and peak_heights; ours use the fitted vertex, hence 3 % and 2 %.
      expect(Math.abs(peaks[k].fwhm / ref.widths[k] - 1)).toBeLessThan(0.03);
      expect(Math.abs(peaks[k].height / ref.peakHeights[k] - 1)).toBeLessThan(0.02);
    });
  });
});

describe("stages", () => {
  it("fitPeakTop returns a sampled Gaussian's centre and height exactly", () => {
    const s = Float64Array.from(
      { length: 9 },
      (_, i) => 80 * Math.exp(-0.5 * ((i - 4.27) / 1.7) ** 2),
    );
    const top = fitPeakTop(s, { index: 4 });
    expect(top.method).toBe("gaussian");
    expect(4 + top.offset).toBeCloseTo(4.27, 12);
    expect(top.height).toBeCloseTo(80, 10);
    expect(() => fitPeakTop(s, { index: 0 })).toThrow(RangeError);
  });

  it("countCurvatureMinima counts two separated lobes and one noisy lobe once", () => {
    const two = Float64Array.from(
      { length: 40 },
      (_, i) => -Math.exp(-0.5 * ((i - 12) / 2) ** 2) - Math.exp(-0.5 * ((i - 26) / 2) ** 2),
    );
    expect(countCurvatureMinima(two, { start: 0, end: 39, threshold: 0.3 })).toBe(2);
    const one = Float64Array.from(
      { length: 40 },
      (_, i) => -Math.exp(-0.5 * ((i - 20) / 4) ** 2) + 0.05 * Math.sin(3 * i),
    );
    expect(countCurvatureMinima(one, { start: 0, end: 39, threshold: 0.3 })).toBe(1);
  });

  it("gaussianCentreBound is √(2sΔ/√π)/SNR, i.e. 0.692·√(FWHM·Δ)/SNR (derived Cramér–Rao bound)", () => {
    expect(gaussianCentreBound({ fwhm: 4, spacing: 1, snr: 10 })).toBeCloseTo((0.6922 * 2) / 10, 4);
    expect(gaussianCentreBound({ fwhm: 4, spacing: 1, snr: 0 })).toBe(Infinity);
  });
});

describe("properties (fast-check)", () => {
  const spectrum = fc
    .record({
      n: fc.integer({ min: 16, max: 600 }),
      seed: fc.integer({ min: 0, max: 2 ** 31 - 1 }),
      offset: fc.double({ min: -1e4, max: 1e4, noNaN: true }),
      noise: fc.double({ min: 0, max: 50, noNaN: true }),
      lines: fc.array(
        fc.record({
          at: fc.double({ min: 0, max: 1, noNaN: true }),
          fwhm: fc.double({ min: 0.5, max: 40, noNaN: true }),
          height: fc.double({ min: -100, max: 1e5, noNaN: true }),
        }),
        { maxLength: 8 },
      ),
      step: fc.double({ min: 1e-3, max: 10, noNaN: true }),
      clip: fc.option(fc.double({ min: 0, max: 5e4, noNaN: true })),
    })
    .map(({ n, seed, offset, noise, lines, step, clip }) => {
      let state = seed;
      const next = () => (state = (Math.imul(state, 1103515245) + 12345) >>> 0) / 2 ** 32 - 0.5;
      const x = Float64Array.from({ length: n }, (_, i) => 300 + i * step * (1 + i / (4 * n)));
      const y = Float64Array.from({ length: n }, (_, i) => {
        let v = offset + noise * next();
        for (const l of lines)
          v += l.height * Math.exp(-0.5 * ((i - l.at * n) / (l.fwhm / 2.3548)) ** 2);
        return clip === null ? v : Math.min(v, clip);
      });
      return { x, y };
    });

  it("never throws on valid spectra; peaks come out sorted by x, inside the array, with finite fields", () => {
    fc.assert(
      fc.property(spectrum, ({ x, y }) => {
        const peaks = findPeaks(x, y);
        for (let k = 0; k < peaks.length; k++) {
          const p = peaks[k];
          expect(p.index).toBeGreaterThanOrEqual(0);
          expect(p.index).toBeLessThan(x.length);
          expect(p.x).toBeGreaterThanOrEqual(x[0]);
          expect(p.x).toBeLessThanOrEqual(x[x.length - 1]);
          if (k > 0) expect(p.x).toBeGreaterThanOrEqual(peaks[k - 1].x);
          for (const v of [p.xUncertainty, p.height, p.fwhm, p.area, p.snr])
            expect(Number.isFinite(v)).toBe(true);
          expect(p.xUncertainty).toBeGreaterThan(0);
        }
      }),
      { numRuns: 150 },
    );
  });
});
