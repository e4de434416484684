// Checks that synthetic spectra put known lines, bands, noise and clipping where the truth says.
import { describe, it, expect } from "vitest";
import { synthesizeSpectrum } from "../../../../lib/spectrum/synthetic";

function argMax(y: Float64Array, from = 0, to = y.length - 1): number {
  let best = from;
  for (let i = from; i <= to; i++) if (y[i] > y[best]) best = i;
  return best;
}

describe("synthesizeSpectrum", () => {
  it("places a Gaussian line at the pixel of its wavelength with the requested height and width", () => {
    const spectrum = synthesizeSpectrum({
      pixelCount: 2048,
      wavelengthOfPixel: (px) => 400 + 0.15 * px,
      resolutionNm: 0.6,
      lines: [{ wavelengthNm: 550.05, amplitude: 1000 }],
    });
    const [truth] = spectrum.truth.lines;
    expect(truth.pixel).toBeCloseTo(1000.333, 3);
    expect(truth.fwhmPx).toBeCloseTo(4, 9);
    const top = argMax(spectrum.y);
    expect(top).toBe(1000);
    // Gaussian height at 1/3 px off centre for FWHM 4 px: exp(−4 ln2 (1/3)²/16).
    expect(spectrum.y[top]).toBeCloseTo(1000 * Math.exp((-4 * Math.LN2) / 144), 6);
    // Pixel 999 lies 4/3 px from the centre; a 4 px FWHM falls to half at 2 px.
    expect(spectrum.y[999]).toBeCloseTo(1000 * Math.exp((-4 * Math.LN2 * (4 / 3) ** 2) / 16), 6);
    expect(spectrum.y[998] < 500 && spectrum.y[999] > 500).toBe(true);
  });

  it("converts a width in nm to pixels through the local dispersion of a non-linear axis", () => {
    // A prism-like axis: dispersion grows towards the red.
    const wavelengthOfPixel = (px: number) => 380 + 0.05 * px + 0.00008 * px * px;
    const spectrum = synthesizeSpectrum({
      pixelCount: 2048,
      wavelengthOfPixel,
      resolutionNm: 1,
      lines: [{ wavelengthNm: 400 }, { wavelengthNm: 700 }].map((l) => ({ ...l, amplitude: 100 })),
    });
    const [blue, red] = spectrum.truth.lines;
    const dispersionAt = (px: number) => 0.05 + 0.00016 * px;
    expect(blue.fwhmPx).toBeCloseTo(1 / dispersionAt(blue.pixel), 1);
    expect(red.fwhmPx).toBeCloseTo(1 / dispersionAt(red.pixel), 1);
    expect(blue.fwhmPx).toBeGreaterThan(red.fwhmPx);
    expect(wavelengthOfPixel(red.pixel)).toBeCloseTo(700, 2);
  });

  it("puts blue at high pixel when the axis is reversed", () => {
    const spectrum = synthesizeSpectrum({
      pixelCount: 1000,
      wavelengthOfPixel: (px) => 400 + 0.3 * px,
      reverseAxis: true,
      lines: [{ wavelengthNm: 460, amplitude: 50 }],
    });
    const grid = spectrum.truth.wavelengthNmAtPixel;
    expect(grid[0]).toBeCloseTo(400 + 0.3 * 999, 9);
    expect(grid[999]).toBeCloseTo(400, 9);
    expect(spectrum.truth.lines[0].pixel).toBeCloseTo(799, 6);
    expect(argMax(spectrum.y)).toBe(799);
  });

  it("draws a band with a sharp head that fades towards the stated side", () => {
    const spectrum = synthesizeSpectrum({
      pixelCount: 2000,
      wavelengthOfPixel: (px) => 500 + 0.1 * px,
      resolutionNm: 0.5,
      bands: [{ headNm: 554, extentNm: 10, degradesTo: "red", amplitude: 200 }],
    });
    const headPx = spectrum.truth.bands[0].pixel;
    expect(headPx).toBeCloseTo(540, 6);
    const y = spectrum.truth.signal;
    // Blue of the head: only the instrument's blur; red of it: the band's slow fall.
    expect(y[540 - 20]).toBeLessThan(1);
    expect(y[540 + 20]).toBeGreaterThan(50);
    const top = argMax(y);
    expect(top).toBeGreaterThanOrEqual(540);
    expect(top).toBeLessThanOrEqual(548);
    // Deep in the band the exponential e^(−3d/extent) holds: at d = 5 nm, 200·e^(−1.5).
    expect(y[590]).toBeCloseTo(200 * Math.exp(-1.5), 0);
    expect(y[540 + 100 + 30]).toBeLessThan(0.5);

    const violet = synthesizeSpectrum({
      pixelCount: 2000,
      wavelengthOfPixel: (px) => 500 + 0.1 * px,
      resolutionNm: 0.5,
      bands: [{ headNm: 554, extentNm: 10, degradesTo: "violet", amplitude: 200 }],
    });
    expect(violet.truth.signal[520]).toBeGreaterThan(50);
    expect(violet.truth.signal[560]).toBeLessThan(1);
  });

  it("adds a Planck continuum that peaks at its stated height and rises to the red for a flame", () => {
    const spectrum = synthesizeSpectrum({
      pixelCount: 1000,
      wavelengthOfPixel: (px) => 400 + 0.4 * px,
      continuum: { shape: "planck", temperatureK: 2200, peakCounts: 300 },
    });
    const y = spectrum.truth.signal;
    // Wien's displacement (b = 2.897771955e6 nm·K, CODATA 2018) puts a 2200 K maximum near
    // 1317 nm, beyond this range, so the hump still rises at 800 nm.
    expect(Math.max(...y)).toBeCloseTo(300, 9);
    expect(y[999]).toBeCloseTo(300, 9);
    expect(y[0]).toBeLessThan(y[500]);
  });

  it("evaluates a polynomial continuum in the normalised wavelength u ∈ [−1, 1]", () => {
    const spectrum = synthesizeSpectrum({
      pixelCount: 101,
      wavelengthOfPixel: (px) => 500 + px,
      continuum: { shape: "polynomial", coefficients: [100, 0, -50] },
    });
    expect(spectrum.y[0]).toBeCloseTo(50, 9);
    expect(spectrum.y[50]).toBeCloseTo(100, 9);
    expect(spectrum.y[100]).toBeCloseTo(50, 9);
  });

  it("adds the dark level, clips at the detector maximum and is reproducible from its seed", () => {
    const options = {
      pixelCount: 500,
      wavelengthOfPixel: (px: number) => 580 + 0.04 * px,
      resolutionNm: 0.3,
      lines: [{ wavelengthNm: 589, amplitude: 80000 }],
      darkCounts: 900,
      readNoiseCounts: 5,
      shotNoise: true,
      saturationCounts: 65535,
      seed: 3,
    };
    const a = synthesizeSpectrum(options);
    const b = synthesizeSpectrum(options);
    const c = synthesizeSpectrum({ ...options, seed: 4 });
    expect(Array.from(a.y)).toEqual(Array.from(b.y));
    expect(Array.from(a.y)).not.toEqual(Array.from(c.y));
    expect(Math.max(...a.y)).toBe(65535);
    const clipped = a.y.filter((v) => v === 65535).length;
    expect(clipped).toBeGreaterThan(3);
    // Far from the line only the dark level and read noise remain: mean 900, sd 5.
    const tail = Array.from(a.y.subarray(0, 100));
    const mean = tail.reduce((s, v) => s + v, 0) / tail.length;
    const sd = Math.sqrt(tail.reduce((s, v) => s + (v - mean) ** 2, 0) / (tail.length - 1));
    expect(Math.abs(mean - 900)).toBeLessThan(2);
    expect(sd).toBeGreaterThan(3.5);
    expect(sd).toBeLessThan(6.5);
  });

  it("gives shot noise whose variance follows the signal", () => {
    const spectrum = synthesizeSpectrum({
      pixelCount: 4000,
      wavelengthOfPixel: (px) => 400 + 0.1 * px,
      continuum: { shape: "polynomial", coefficients: [400] },
      shotNoise: true,
      seed: 9,
    });
    const y = Array.from(spectrum.y);
    const mean = y.reduce((s, v) => s + v, 0) / y.length;
    const variance = y.reduce((s, v) => s + (v - mean) ** 2, 0) / (y.length - 1);
    expect(Math.abs(mean - 400)).toBeLessThan(2);
    expect(Math.abs(variance / 400 - 1)).toBeLessThan(0.1);
  });

  it("leaves out lines outside the range and refuses a non-monotonic axis", () => {
    const spectrum = synthesizeSpectrum({
      pixelCount: 100,
      wavelengthOfPixel: (px) => 500 + px,
      lines: [{ wavelengthNm: 450, amplitude: 10 }],
    });
    expect(spectrum.truth.lines).toHaveLength(0);
    expect(Math.max(...spectrum.y)).toBe(0);
    expect(() =>
      synthesizeSpectrum({ pixelCount: 100, wavelengthOfPixel: (px) => 500 + (px - 50) ** 2 }),
    ).toThrow(RangeError);
    expect(() => synthesizeSpectrum({ pixelCount: 2 })).toThrow(RangeError);
  });
});
