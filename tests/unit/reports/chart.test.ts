// The report chart's geometry and thinning: ticks at round wavelengths, every line's maximum kept
// when thinning, labels placed above their peaks without overlapping.
import { describe, expect, it } from "vitest";
import { chartGeometry, chartLabelsFromCalls, niceTicks } from "@/lib/reports/chart-geometry";
import { thinSeries } from "@/lib/charts/thin-series";
import { sampleRun } from "./fixtures";

describe("niceTicks", () => {
  it("steps by 1, 2 or 5 × 10^k inside the range", () => {
    expect(niceTicks(400, 800, 4)).toEqual([400, 500, 600, 700, 800]);
    expect(niceTicks(588.3, 590.1, 5)).toEqual([588.5, 589, 589.5, 590]);
    expect(niceTicks(0, 7300, 4)).toEqual([0, 2000, 4000, 6000]);
  });
});

describe("thinSeries for the report chart", () => {
  it("keeps every narrow maximum and the order of x", () => {
    const n = 100_000;
    const x = Float64Array.from({ length: n }, (_, i) => 300 + i * 0.006);
    const y = new Float64Array(n).fill(10);
    const lines = [1234, 50_001, 99_998];
    for (const i of lines) y[i] = 9000 + i;
    const thin = thinSeries(x, y, {}, 3000);
    expect(thin.x.length).toBeLessThanOrEqual(3000);
    for (const i of lines) expect(Array.from(thin.y)).toContain(9000 + i);
    for (let i = 1; i < thin.x.length; i++) expect(thin.x[i]).toBeGreaterThan(thin.x[i - 1]);
  });

  it("returns a copy when there is nothing to thin", () => {
    const x = Float64Array.of(1, 2, 3);
    const thin = thinSeries(x, Float64Array.of(4, 5, 6));
    expect(Array.from(thin.x)).toEqual([1, 2, 3]);
    expect(thin.x).not.toBe(x);
  });
});

describe("chartGeometry", () => {
  const x = Float64Array.from({ length: 401 }, (_, i) => 400 + i);
  const y = Float64Array.from(
    x,
    (nm) =>
      50 + 4000 * Math.exp(-(((nm - 589) / 1.5) ** 2)) + 300 * Math.exp(-(((nm - 766) / 1.5) ** 2)),
  );
  const g = chartGeometry(x, y, chartLabelsFromCalls(sampleRun().calls), {
    width: 500,
    height: 250,
  });

  it("maps the range onto the plot with ticks in nm", () => {
    expect(g.xTicks.map((t) => t.text)).toEqual(["400", "500", "600", "700", "800"]);
    expect(g.xTicks[0].at).toBeCloseTo(g.plot.left, 6);
    expect(g.xTicks.at(-1)!.at).toBeCloseTo(g.plot.right, 6);
    expect(g.trace).toHaveLength(401);
  });

  it("labels each called peak once (absent calls get none) and puts the text above it", () => {
    expect(g.labels.map((l) => l.text).sort()).toEqual(["K I", "Na I", "Na I"]);
    for (const l of g.labels) {
      expect(l.textY).toBeLessThan(g.plot.top);
      expect(l.peakY).toBeGreaterThanOrEqual(g.plot.top);
    }
    // The two sodium labels 0.6 nm apart cannot share a row: they are staggered.
    const na = g.labels.filter((l) => l.text === "Na I");
    expect(na[0].textY).not.toBe(na[1].textY);
  });
});
