// The dip between two lines of one Gaussian instrument profile, which decides whether a fainter
// companion could have shown as a peak of its own or hides in the stronger line.
import { describe, expect, it } from "vitest";
import { twoLineDip } from "@/lib/spectrum/matching/two-line-dip";

const FOUR_LN2 = 4 * Math.LN2;
const gaussian = (x: number) => Math.exp(-FOUR_LN2 * x * x);

describe("twoLineDip", () => {
  it("has no dip for equal lines inside the Sparrow limit and one beyond it", () => {
    // Two equal Gaussians merge into one flat top at a separation of 2σ = 0.849 FWHM (the Sparrow
    // limit; common practice).
    expect(twoLineDip(0.8, 1)).toBe(0);
    expect(twoLineDip(0.95, 1)).toBeGreaterThan(0);
  });

  it("matches the closed form for equal lines two FWHM apart", () => {
    // The valley lies midway; each line's maximum carries the other's far wing.
    const valley = 2 * gaussian(1);
    const top = 1 + gaussian(2);
    expect(twoLineDip(2, 1)).toBeCloseTo(top - valley, 3);
  });

  it("grows with the separation and with the companion's height", () => {
    expect(twoLineDip(1.25, 0.5)).toBeLessThan(twoLineDip(1.5, 0.5));
    expect(twoLineDip(1.5, 0.25)).toBeLessThan(twoLineDip(1.5, 0.5));
    // The sodium D pair at 0.46 nm resolution (0.597 nm apart, D1 half of D2): a dip of a few
    // per cent of D2, under 6 σ at an SNR of 40.
    expect(40 * twoLineDip(0.597 / 0.464, 0.5)).toBeLessThan(6);
  });

  it("is 0 for a companion stronger than the line or a separation that is no separation", () => {
    expect(twoLineDip(1.5, 1.5)).toBe(0);
    expect(twoLineDip(0, 0.5)).toBe(0);
    expect(twoLineDip(Number.NaN, 0.5)).toBe(0);
  });
});
