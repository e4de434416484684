// Checks the width trend read from a sample's clean peaks on an axis already in nm: flat for a
// grating, steep for a prism, robust to a band among the peaks, and none where it cannot be read.
import { describe, it, expect } from "vitest";
import { estimateInstrumentFwhmTrend, instrumentFwhmAt } from "../../../../lib/spectrum/analysis";
import type { Peak } from "../../../../lib/spectrum/types";

function peak(x: number, fwhm: number, snr: number, extra: Partial<Peak> = {}): Peak {
  return {
    index: Math.round(x),
    x,
    xUncertainty: 0.01,
    height: 10 * snr,
    fwhm,
    area: 10 * snr * fwhm,
    snr,
    saturated: false,
    blended: false,
    ...extra,
  };
}

describe("estimateInstrumentFwhmTrend", () => {
  it("recovers a prism-like law, FWHM ∝ λ³, from clean peaks across the visible", () => {
    const law = (nm: number) => 0.5 * (nm / 500) ** 3;
    const peaks = [410, 450, 480, 520, 560, 610, 660, 700].map((nm, i) =>
      peak(nm, law(nm), 100 + i),
    );
    const trend = estimateInstrumentFwhmTrend(peaks)!;
    expect(trend.exponent).toBeCloseTo(3, 9);
    for (const nm of [400, 500, 650, 720])
      expect(instrumentFwhmAt(trend, nm)).toBeCloseTo(law(nm), 9);
  });

  it("is flat for a grating and is not moved by a band and a blend among the peaks", () => {
    const peaks = [420, 465, 510, 560, 600, 630, 680].map((nm) => peak(nm, 0.6, 200));
    // A band 6 nm wide that was not flagged, and a blend that was (the latter is left out anyway).
    peaks.push(peak(605, 6, 150), peak(540, 1.5, 300, { blended: true }));
    const trend = estimateInstrumentFwhmTrend(peaks)!;
    expect(trend.exponent).toBeCloseTo(0, 9);
    expect(instrumentFwhmAt(trend, 450)).toBeCloseTo(0.6, 9);
  });

  it("reads nothing from too few clean peaks, or from peaks bunched in one part of the axis", () => {
    const four = [420, 500, 580, 660].map((nm) => peak(nm, 0.6, 200));
    expect(estimateInstrumentFwhmTrend(four)).toBeNull();
    const weak = [...four, peak(700, 0.6, 19)];
    expect(estimateInstrumentFwhmTrend(weak)).toBeNull();
    const bunched = [500, 505, 510, 515, 520, 530].map((nm) => peak(nm, 0.6, 200));
    expect(estimateInstrumentFwhmTrend(bunched)).toBeNull();
    expect(estimateInstrumentFwhmTrend(bunched, { minSpanRatio: 1.05 })).not.toBeNull();
  });

  it("keeps the exponent within ±maxExponent and refuses bad options", () => {
    const steep = [400, 420, 440, 460, 480].map((nm) => peak(nm, (nm / 400) ** 12, 100));
    expect(estimateInstrumentFwhmTrend(steep)!.exponent).toBe(5);
    expect(estimateInstrumentFwhmTrend(steep, { maxExponent: 2 })!.exponent).toBe(2);
    expect(() => estimateInstrumentFwhmTrend([], { minPeaks: 1 })).toThrow(RangeError);
    expect(() => estimateInstrumentFwhmTrend([], { minSpanRatio: 0.9 })).toThrow(RangeError);
    expect(() => estimateInstrumentFwhmTrend([], { minSnr: Number.NaN })).toThrow(RangeError);
  });
});
