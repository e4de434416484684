// Robust noise: white Gaussian noise of σ returns σ, with or without peaks and a sloping continuum.
import { describe, it, expect } from "vitest";
import { estimateNoise, xMedian } from "@/lib/spectrum/signal";
import { makeRandom } from "@/lib/spectrum/statistics/make-random";

function noisy(
  n: number,
  sigma: number,
  seed: number,
  shape: (i: number) => number = () => 0,
): Float64Array {
  const { normal } = makeRandom(seed);
  return Float64Array.from({ length: n }, (_, i) => shape(i) + sigma * normal());
}

describe("estimateNoise", () => {
  it("returns σ for white Gaussian noise (within 4 % at 20 000 samples)", () => {
    for (const [sigma, seed] of [
      [1, 1],
      [3.5, 2],
      [250, 3],
    ]) {
      const y = noisy(20_000, sigma, seed);
      expect(Math.abs(estimateNoise(y) / sigma - 1)).toBeLessThan(0.04);
      expect(Math.abs(estimateNoise(y, { differenceOrder: 1 }) / sigma - 1)).toBeLessThan(0.04);
    }
  });

  it("ignores peaks and a curved, sloping continuum (within 6 %)", () => {
    const shape = (i: number) =>
      1000 +
      0.8 * i +
      200 * Math.sin(i / 900) +
      5000 * Math.exp(-0.5 * ((i - 3000) / 3) ** 2) +
      800 * Math.exp(-0.5 * ((i - 7000) / 6) ** 2);
    const y = noisy(10_000, 4, 7, shape);
    expect(Math.abs(estimateNoise(y) / 4 - 1)).toBeLessThan(0.06);
  });

  it("returns 0 for a noise-free straight line and rejects too-short input", () => {
    expect(estimateNoise(Float64Array.from({ length: 50 }, (_, i) => 3 + 2 * i))).toBeCloseTo(
      0,
      12,
    );
    expect(() => estimateNoise(Float64Array.of(1, 2))).toThrow(RangeError);
  });
});

describe("xMedian", () => {
  it("agrees with sorting on odd, even and repeated values", () => {
    const { uniform } = makeRandom(11);
    for (const n of [1, 2, 3, 10, 101, 1000]) {
      const v = Float64Array.from({ length: n }, () => Math.round(uniform() * 20));
      const sorted = Array.from(v).sort((a, b) => a - b);
      const expected = n % 2 ? sorted[(n - 1) / 2] : (sorted[n / 2 - 1] + sorted[n / 2]) / 2;
      expect(xMedian(v)).toBe(expected);
    }
  });
});
