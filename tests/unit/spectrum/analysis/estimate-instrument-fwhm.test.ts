// Checks the instrument-width estimate: the median FWHM of the clearest clean peaks, or none.
import { describe, it, expect } from "vitest";
import { estimateInstrumentFwhm } from "../../../../lib/spectrum/analysis";
import type { Peak } from "../../../../lib/spectrum/types";

function peak(x: number, fwhm: number, snr: number, extra: Partial<Peak> = {}): Peak {
  return {
    index: Math.round(x),
    x,
    xUncertainty: 0.05,
    height: 10 * snr,
    fwhm,
    area: 10 * snr * fwhm,
    snr,
    saturated: false,
    blended: false,
    ...extra,
  };
}

describe("estimateInstrumentFwhm", () => {
  it("takes the median FWHM of the highest-SNR clean peaks, ignoring weak, blended and saturated ones", () => {
    const peaks = [
      peak(100, 3.0, 300),
      peak(200, 3.4, 250),
      peak(300, 3.2, 90),
      peak(400, 12, 400, { saturated: true }),
      peak(500, 8, 350, { blended: true }),
      peak(600, 15, 19.9),
    ];
    expect(estimateInstrumentFwhm(peaks)).toBe(3.2);
  });

  it("looks only at the maxPeaks strongest and averages the middle two of an even count", () => {
    const strong = Array.from({ length: 10 }, (_, i) => peak(100 * i, 3 + 0.1 * i, 1000 - i));
    const wideButWeaker = Array.from({ length: 15 }, (_, i) => peak(2000 + 10 * i, 20, 50));
    // Widths 3.0 … 3.9: the middle two are 3.4 and 3.5.
    expect(estimateInstrumentFwhm([...wideButWeaker, ...strong])).toBeCloseTo(3.45, 12);
    expect(estimateInstrumentFwhm(strong, { maxPeaks: 3 })).toBeCloseTo(3.1, 12);
  });

  it("gives no estimate from fewer than minPeaks clean peaks", () => {
    const peaks = [peak(100, 3, 300), peak(200, 3, 300), peak(300, 3, 300, { blended: true })];
    expect(estimateInstrumentFwhm(peaks)).toBeNull();
    expect(estimateInstrumentFwhm(peaks, { minPeaks: 2 })).toBe(3);
    expect(estimateInstrumentFwhm([])).toBeNull();
  });

  it("rejects nonsense settings", () => {
    expect(() => estimateInstrumentFwhm([], { minSnr: -1 })).toThrow(RangeError);
    expect(() => estimateInstrumentFwhm([], { maxPeaks: 0 })).toThrow(RangeError);
    expect(() => estimateInstrumentFwhm([], { minPeaks: 1.5 })).toThrow(RangeError);
  });
});
