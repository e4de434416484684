// One-sample spikes (hot pixels, cosmic-ray hits) are replaced by their neighbours' mean; lines, which
// a spectrometer images over two samples or more, are left exactly as they were, however strong.
import { describe, expect, it } from "vitest";
import { removeSpikes } from "@/lib/spectrum/signal/remove-spikes";
import { makeRandom } from "@/lib/spectrum/statistics/make-random";

/** A continuum of 1000 counts with Gaussian lines (FWHM in samples) and read noise of σ 5 counts. */
function spectrum(lines: { at: number; height: number; fwhm: number }[], seed = 1): Float64Array {
  const random = makeRandom(seed).uniform;
  return Float64Array.from({ length: 400 }, (_, i) => {
    let value = 1000;
    for (const line of lines) {
      const sigma = line.fwhm / 2.3548;
      value += line.height * Math.exp(-0.5 * ((i - line.at) / sigma) ** 2);
    }
    // Box–Muller from the seeded uniform draws.
    const u = Math.max(random(), 1e-12);
    return value + 5 * Math.sqrt(-2 * Math.log(u)) * Math.cos(2 * Math.PI * random());
  });
}

describe("removeSpikes", () => {
  it("replaces hot pixels by their neighbours and reports where they were", () => {
    const y = spectrum([{ at: 100, height: 3000, fwhm: 4 }]);
    y[50] += 20000;
    y[300] += 600;
    const { y: cleaned, spikes } = removeSpikes(y);
    expect(spikes).toEqual([50, 300]);
    expect(cleaned[50]).toBeCloseTo(0.5 * (y[49] + y[51]), 9);
    expect(Math.abs(cleaned[300] - 1000)).toBeLessThan(30);
  });

  it("leaves lines two samples wide and more untouched, however strong", () => {
    const y = spectrum([
      { at: 80, height: 50000, fwhm: 2 },
      { at: 160, height: 800, fwhm: 2.5 },
      { at: 240, height: 20000, fwhm: 6 },
    ]);
    const { y: cleaned, spikes } = removeSpikes(y);
    expect(spikes).toEqual([]);
    expect(Array.from(cleaned)).toEqual(Array.from(y));
  });

  it("leaves noise alone and does not change its input", () => {
    const y = spectrum([], 7);
    const copy = Float64Array.from(y);
    expect(removeSpikes(y).spikes).toEqual([]);
    expect(Array.from(y)).toEqual(Array.from(copy));
  });

  it("refuses settings that make no sense", () => {
    const y = spectrum([]);
    expect(() => removeSpikes(y, { minSnr: 0 })).toThrow(RangeError);
    expect(() => removeSpikes(y, { maxNeighbourShare: 1 })).toThrow(RangeError);
    expect(() => removeSpikes(y, { halfWindow: 1.5 })).toThrow(RangeError);
    expect(() => removeSpikes(Float64Array.of(1, Number.NaN, 2))).toThrow();
  });
});
