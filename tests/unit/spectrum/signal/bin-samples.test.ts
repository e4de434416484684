// Binning keeps the axis and a line's centre, and lowers white noise by √factor.
import { describe, expect, it } from "vitest";
import { binSamples } from "@/lib/spectrum/signal/bin-samples";
import { binningFactorFor } from "@/lib/spectrum/signal/binning-factor-for";
import { estimateNoise } from "@/lib/spectrum/signal/estimate-noise";
import { makeRandom } from "@/lib/spectrum/statistics/make-random";

describe("binSamples", () => {
  it("averages x and y per bin, the last bin holding the remainder", () => {
    const x = Float64Array.from([0, 1, 2, 3, 4, 5, 6]);
    const y = Float64Array.from([1, 3, 5, 7, 9, 11, 13]);
    const binned = binSamples(x, y, { factor: 3 });
    expect(Array.from(binned.x)).toEqual([1, 4, 6]);
    expect(Array.from(binned.y)).toEqual([3, 9, 13]);
  });

  it("keeps a Gaussian line's centre and divides white noise by √factor", () => {
    const random = makeRandom(5);
    const n = 60_000;
    const x = Float64Array.from({ length: n }, (_, i) => i);
    const y = Float64Array.from(
      { length: n },
      (_, i) => 1000 * Math.exp(-0.5 * ((i - 31_234.5) / 900) ** 2) + 10 * random.normal(),
    );
    const binned = binSamples(x, y, { factor: 100 });
    let sum = 0;
    let weighted = 0;
    for (let i = 0; i < binned.x.length; i++) {
      if (Math.abs(binned.x[i] - 31_234.5) > 3 * 900) continue;
      sum += binned.y[i];
      weighted += binned.y[i] * binned.x[i];
    }
    // The centroid over ±3σ of the binned line stays within a few samples of the truth (noise moves it
    // by about 10·√(5400)·σ_x/ΣY ≈ 1–2 samples).
    expect(Math.abs(weighted / sum - 31_234.5)).toBeLessThan(5);
    const noiseOnly = Float64Array.from({ length: n }, () => 10 * random.normal());
    const binnedNoise = binSamples(x, noiseOnly, { factor: 100 }).y;
    // σ/√100 = 1, within the noise estimate's own scatter over 600 bins.
    expect(estimateNoise(binnedNoise)).toBeGreaterThan(0.85);
    expect(estimateNoise(binnedNoise)).toBeLessThan(1.15);
  });

  it("refuses a factor that is not a positive integer and mismatched arrays", () => {
    const x = Float64Array.from([0, 1, 2]);
    expect(() => binSamples(x, x, { factor: 0 })).toThrow(RangeError);
    expect(() => binSamples(x, x, { factor: 1.5 })).toThrow(RangeError);
    expect(() => binSamples(x, Float64Array.from([1, 2]), { factor: 2 })).toThrow(RangeError);
  });
});

describe("binningFactorFor", () => {
  it("leaves about six samples across a line, and never bins a coarsely sampled one", () => {
    expect(binningFactorFor(1900)).toBe(316);
    expect(binningFactorFor(4)).toBe(1);
    expect(binningFactorFor(Number.NaN)).toBe(1);
  });
});
