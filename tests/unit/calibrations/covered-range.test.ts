// A used pair inside or outside the covered range a calibration claims.
import { describe, expect, it } from "vitest";
import { withinCoveredRange } from "@/lib/calibrations/covered-range";

describe("withinCoveredRange", () => {
  const claimed: [number, number] = [407.783, 852.144];
  const pair = (wavelengthNm: number, residualNm = 0.01) => ({ wavelengthNm, residualNm });

  it("holds the pairs whose lines end a claimed range, whatever their residuals", () => {
    expect(withinCoveredRange(pair(407.783, 0.0148), claimed)).toBe(true);
    expect(withinCoveredRange(pair(852.144, -0.0098), claimed)).toBe(true);
    expect(withinCoveredRange(pair(546.074), claimed)).toBe(true);
  });

  it("holds an end pair a drift's range ends a residual short of, on the calibrated axis", () => {
    // The recalibrated lamp of the e2e workbench: its range shown as ending at 852.14 nm, its end
    // pair Ar I 852.144 nm with a residual of 0.0098 nm.
    expect(withinCoveredRange(pair(852.144, 0.0098), [407.77, 852.135])).toBe(true);
  });

  it("leaves out the pairs beyond either end (fitted but not claimed)", () => {
    expect(withinCoveredRange(pair(394.898, -0.0262), claimed)).toBe(false);
    expect(withinCoveredRange(pair(866.794, -0.0098), claimed)).toBe(false);
    expect(withinCoveredRange(pair(852.2, 0.01), claimed)).toBe(false);
  });
});
