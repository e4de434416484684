// The browser-bound thinning of long series: short series pass unchanged; long ones keep every stretch's
// lowest and highest sample, so a one-sample line (or dip) survives, never send more than the limit,
// keep the input's x order (rising wavelengths or falling wavenumbers) and the companion series' values
// at the same samples.
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { MAX_CHART_POINTS, thinSeries, thinnedIndices } from "@/lib/charts/thin-series";

/** A noisy flat baseline of n samples from a fixed linear congruential sequence (no Math.random). */
function noisyBaseline(n: number, seed = 7): Float64Array {
  const y = new Float64Array(n);
  let state = seed;
  for (let i = 0; i < n; i++) {
    state = (state * 1_103_515_245 + 12_345) % 2 ** 31;
    y[i] = 100 + (state / 2 ** 31) * 10;
  }
  return y;
}

describe("thinSeries", () => {
  it("passes a series within the limit unchanged and says nothing was dropped", () => {
    const x = [1, 2, 3];
    const y = [5, 6, 7];
    expect(thinSeries(x, y, { c: [0, 1, 2] }, 10)).toEqual({
      x,
      y,
      companions: { c: [0, 1, 2] },
      sourcePoints: 3,
    });
  });

  it("leaves a 3,648-pixel array as it is at the default limit", () => {
    const y = noisyBaseline(3648);
    expect(thinnedIndices(y)).toHaveLength(3648);
  });

  it("keeps a one-sample line and a one-sample dip in a noisy 100,000-point spectrum", () => {
    const n = 100_000;
    const x = Float64Array.from({ length: n }, (_, i) => 400 + i * 0.003);
    const y = noisyBaseline(n);
    y[54_321] = 1000; // a line one sample wide, ten times the noise band above the baseline
    y[70_001] = 10; // a dropped-out pixel
    const continuum = Float64Array.from({ length: n }, (_, i) => 2 * i);
    const thin = thinSeries(x, y, { continuum });
    expect(thin.sourcePoints).toBe(n);
    expect(thin.x.length).toBeLessThanOrEqual(MAX_CHART_POINTS);
    expect(thin.x.length).toBeGreaterThan(MAX_CHART_POINTS / 2);
    const line = thin.y.indexOf(1000);
    expect(line).toBeGreaterThanOrEqual(0);
    expect(thin.x[line]).toBe(x[54_321]);
    const dip = thin.y.indexOf(10);
    expect(dip).toBeGreaterThanOrEqual(0);
    expect(thin.x[dip]).toBe(x[70_001]);
    // The companion is read at the same samples: continuum[i] = 2i.
    const kept = thinnedIndices(y);
    kept.forEach((i, k) => expect(thin.companions.continuum[k]).toBe(2 * i));
  });

  it("keeps falling wavenumbers falling", () => {
    const n = 20_000;
    const x = Float64Array.from({ length: n }, (_, i) => 25_000 - i * 0.5);
    const thin = thinSeries(x, noisyBaseline(n), {}, 1000);
    expect(thin.x.every((v, k) => k === 0 || v < thin.x[k - 1])).toBe(true);
  });

  it("keeps a stretch that is all NaN as one sample and skips NaN beside numbers", () => {
    const y = [NaN, NaN, NaN, NaN, 1, NaN, 5, 2];
    expect(thinnedIndices(y, 8)).toHaveLength(8);
    // Two stretches of four: [NaN NaN NaN NaN] keeps its first, [1 NaN 5 2] its lowest and highest.
    expect(thinnedIndices(y, 4)).toEqual([0, 4, 6]);
  });

  it("refuses a limit below 2 and series of different lengths", () => {
    expect(() => thinnedIndices([1, 2, 3], 1)).toThrow(RangeError);
    expect(() => thinnedIndices([1, 2, 3], 2.5)).toThrow(RangeError);
    expect(() => thinSeries([1, 2], [1, 2, 3])).toThrow(/same length/);
    expect(() => thinSeries([1, 2, 3], [1, 2, 3], { continuum: [1] })).toThrow(/continuum/);
  });

  it("never exceeds the limit, keeps indices rising and keeps the highest and lowest sample", () => {
    fc.assert(
      fc.property(
        fc.array(fc.double({ min: -1e6, max: 1e6, noNaN: true }), {
          minLength: 1,
          maxLength: 3000,
        }),
        fc.integer({ min: 2, max: 500 }),
        (values, maxPoints) => {
          const kept = thinnedIndices(values, maxPoints);
          expect(kept.length).toBeLessThanOrEqual(maxPoints);
          expect(kept.every((v, k) => k === 0 || v > kept[k - 1])).toBe(true);
          const ys = kept.map((i) => values[i]);
          expect(Math.max(...ys)).toBe(Math.max(...values));
          expect(Math.min(...ys)).toBe(Math.min(...values));
        },
      ),
    );
  });
});
