// The browser-bound thinning of long series: short series pass unchanged, long ones keep every bucket's
// extremes (so a one-sample spike survives) and the companion series' values at the same samples.
import { describe, expect, it } from "vitest";
import { thinSeries, thinnedIndices } from "@/lib/charts/thin-series";

describe("thinSeries", () => {
  it("passes a series within the limit unchanged", () => {
    const x = [1, 2, 3];
    const y = [5, 6, 7];
    expect(thinSeries(x, y, { c: [0, 1, 2] }, 10)).toEqual({ x, y, companions: { c: [0, 1, 2] } });
  });

  it("keeps a one-sample spike and the companions at the kept samples", () => {
    const n = 100_000;
    const x = Float64Array.from({ length: n }, (_, i) => i);
    const y = Float64Array.from({ length: n }, (_, i) => (i === 54_321 ? 1000 : Math.sin(i / 50)));
    const continuum = Float64Array.from({ length: n }, (_, i) => 2 * i);
    const thin = thinSeries(x, y, { continuum }, 8000);
    expect(thin.x.length).toBeLessThanOrEqual(8000 + 2);
    expect(thin.y).toContain(1000);
    expect(thin.x[thin.y.indexOf(1000)]).toBe(54_321);
    thin.x.forEach((xi, k) => expect(thin.companions.continuum[k]).toBe(2 * xi));
    const kept = thinnedIndices(y, 8000);
    expect(kept.every((v, k) => k === 0 || v > kept[k - 1])).toBe(true);
  });
});
