// Checks that the seeded draws repeat for a seed and follow their distributions.
import { describe, it, expect } from "vitest";
import { makeRandom } from "@/lib/spectrum/statistics/make-random";

describe("makeRandom", () => {
  it("repeats the same stream for the same seed and differs for another", () => {
    const a = makeRandom(42);
    const b = makeRandom(42);
    const c = makeRandom(43);
    const drawsA = Array.from({ length: 5 }, () => a.uniform());
    const drawsB = Array.from({ length: 5 }, () => b.uniform());
    const drawsC = Array.from({ length: 5 }, () => c.uniform());
    expect(drawsA).toEqual(drawsB);
    expect(drawsA).not.toEqual(drawsC);
  });

  it("draws normals with mean 0 and standard deviation 1 within sampling error", () => {
    const random = makeRandom(7);
    const n = 20000;
    let sum = 0;
    let sumSq = 0;
    for (let i = 0; i < n; i++) {
      const v = random.normal();
      sum += v;
      sumSq += v * v;
    }
    const mean = sum / n;
    const sd = Math.sqrt(sumSq / n - mean * mean);
    // 5 standard errors: 5/√20000 ≈ 0.035 for the mean, ≈ 0.025 for the standard deviation.
    expect(Math.abs(mean)).toBeLessThan(0.035);
    expect(Math.abs(sd - 1)).toBeLessThan(0.025);
  });

  it("draws Poisson counts whose mean and variance equal the rate, below and above 30", () => {
    for (const rate of [4, 120]) {
      const random = makeRandom(11);
      const n = 20000;
      let sum = 0;
      let sumSq = 0;
      for (let i = 0; i < n; i++) {
        const v = random.poisson(rate);
        sum += v;
        sumSq += v * v;
      }
      const mean = sum / n;
      const variance = sumSq / n - mean * mean;
      expect(Math.abs(mean - rate)).toBeLessThan(5 * Math.sqrt(rate / n));
      expect(Math.abs(variance / rate - 1)).toBeLessThan(0.05);
    }
  });
});
