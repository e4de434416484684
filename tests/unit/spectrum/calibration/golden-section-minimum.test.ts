// The golden-section search the prism fit and the blend's top share.
import { describe, expect, it } from "vitest";
import { goldenSectionMinimum } from "@/lib/spectrum/calibration/golden-section-minimum";

describe("goldenSectionMinimum", () => {
  it("finds a smooth minimum as closely as double precision tells its values apart", () => {
    // Near a smooth minimum f changes by (δx)², so values tell places apart only to about √ε ≈ 1.5e-8
    // relative (common practice): a tolerance of 1e-10 ends within that of the true place.
    expect(goldenSectionMinimum((x) => (x - 2) ** 2 + 1, 0, 5, 1e-10)).toBeCloseTo(2, 7);
    // cos is least at π on [2, 4].
    expect(goldenSectionMinimum(Math.cos, 2, 4, 1e-10)).toBeCloseTo(Math.PI, 7);
  });

  it("finds a minimum at the bracket's end, and evaluates once per step", () => {
    let calls = 0;
    const at = goldenSectionMinimum(
      (x) => {
        calls++;
        return x;
      },
      1,
      2,
      1e-6,
    );
    expect(at).toBeCloseTo(1, 5);
    // (√5 − 1)/2 per step: 1 → 1e-6 takes 29 steps, plus the two first points.
    expect(calls).toBe(31);
  });

  it("refuses a tolerance that is not positive", () => {
    expect(() => goldenSectionMinimum(Math.cos, 2, 4, 0)).toThrow(RangeError);
  });
});
