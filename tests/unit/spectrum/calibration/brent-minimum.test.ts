// Brent's minimisation, the prism fit's search for the incidence.
import { describe, expect, it } from "vitest";
import { brentMinimum } from "@/lib/spectrum/calibration/brent-minimum";

/** `f` with a counter of its evaluations. */
function counted(f: (x: number) => number) {
  const counter = { calls: 0, f: (x: number) => (counter.calls++, f(x)) };
  return counter;
}

describe("brentMinimum", () => {
  it("finds smooth minima known in closed form as closely as double precision tells values apart", () => {
    // Near a smooth minimum f changes by (δx)², so values tell places apart only to about √ε ≈ 1.5e-8
    // relative (common practice).
    expect(brentMinimum((x) => (x - 2) ** 2 + 1, 0, 5, 1e-10)).toBeCloseTo(2, 7);
    // cos is least at π on [2, 4].
    expect(brentMinimum(Math.cos, 2, 4, 1e-10)).toBeCloseTo(Math.PI, 7);
    // x·ln x is least at 1/e (its derivative ln x + 1 vanishes there).
    expect(brentMinimum((x) => x * Math.log(x), 0.05, 2, 1e-10)).toBeCloseTo(1 / Math.E, 7);
  });

  it("takes a dozen or so evaluations on a smooth minimum, where golden-section search takes forty", () => {
    const f = counted((x: number) => Math.cosh(3 * (x - 0.7)));
    // The prism fit's bracket: half a degree either side of the best scanned incidence.
    expect(brentMinimum(f.f, 0.7 - 0.0087, 0.7 + 0.0091, 1e-10)).toBeCloseTo(0.7, 7);
    // Golden-section search narrows 0.0178 to 1e-10 in log(1.78e8)/log(1.618) ≈ 39.5 steps.
    expect(f.calls).toBeLessThan(20);
  });

  it("finds a minimum at the bracket's end, or beside a kink, by its golden-section steps", () => {
    expect(brentMinimum((x) => x, 1, 2, 1e-8)).toBeCloseTo(1, 6);
    expect(brentMinimum((x) => -x, 1, 2, 1e-8)).toBeCloseTo(2, 6);
    expect(brentMinimum((x) => Math.abs(x - 0.3), 0, 1, 1e-9)).toBeCloseTo(0.3, 7);
  });

  it("refuses a tolerance that is not positive and an empty bracket", () => {
    expect(() => brentMinimum(Math.cos, 2, 4, 0)).toThrow(RangeError);
    expect(() => brentMinimum(Math.cos, 4, 2, 1e-8)).toThrow(RangeError);
  });
});
