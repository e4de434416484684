// Lines sampled by only 2–3 samples across their FWHM: the smoothing before peak finding must not merge
// two lines 1.5 FWHM apart. The sodium D pair at 0.4 nm resolution and 0.16 nm per sample is the case a
// flame screening instrument meets every day; a 9-sample quartic smoothed its dip away and D1 went
// "missing" beside a D2 of SNR 1000.
import { describe, expect, it } from "vitest";
import { analyzeSample } from "@/lib/spectrum/analysis";
import { synthesizeSpectrum } from "@/lib/spectrum/synthetic";
import { smoothingWindowFor } from "@/lib/spectrum/signal/smoothing-window-for";
import { inventedLine } from "../../../support/invented-line";

// Na I D2 and D1 in air, NIST Atomic Spectra Database (588.995 and 589.592 nm).
const D2_NM = 588.995;
const D1_NM = 589.592;

describe("coarsely sampled lines", () => {
  it("chooses a narrower smoothing window for lines under 3.5 samples wide", () => {
    expect(smoothingWindowFor(2.5)).toBe(7);
    expect(smoothingWindowFor(3.5)).toBe(9);
    expect(smoothingWindowFor(8)).toBe(9);
    expect(smoothingWindowFor(Number.NaN)).toBe(9);
  });

  it("finds both sodium D lines at 0.4 nm resolution and 0.16 nm per sample, D1 half of D2", () => {
    const nmPerSample = 0.16;
    const wavelengthOfPixel = (px: number) => 520 + nmPerSample * px;
    const spectrum = synthesizeSpectrum({
      pixelCount: 1024,
      wavelengthOfPixel,
      resolutionNm: 0.4,
      lines: [
        { wavelengthNm: D2_NM, amplitude: 20000 },
        { wavelengthNm: D1_NM, amplitude: 10000 },
      ],
      readNoiseCounts: 5,
      darkCounts: 280,
      seed: 3,
    });
    const table = [
      inventedLine("Na I", D2_NM, { flame: 1000 }),
      inventedLine("Na I", D1_NM, { flame: 500 }),
    ];
    // The axis already in nm, as a factory-calibrated instrument writes it.
    const nm = Float64Array.from(spectrum.x, wavelengthOfPixel);
    const analysis = analyzeSample(nm, spectrum.y, table, { source: "flame", resolutionNm: 0.4 });
    for (const lineNm of [D2_NM, D1_NM]) {
      const near = analysis.peaks.filter((p) => Math.abs(p.wavelengthNm - lineNm) < 0.05);
      expect(near, `a peak at ${lineNm} nm`).toHaveLength(1);
    }
    const na = analysis.identification.calls.find((c) => c.species === "Na I")!;
    expect(na.seen.map((s) => s.referenceNm).sort()).toEqual([D2_NM, D1_NM]);
    expect(na.missingStrongCount).toBe(0);
  });
});
