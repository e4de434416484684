// A used pair's line inside or outside the covered range a calibration claims.
import { describe, expect, it } from "vitest";
import { withinCoveredRange } from "@/lib/calibrations/covered-range";

describe("withinCoveredRange", () => {
  const covered: [number, number] = [407.783, 852.144];

  it("holds the range's own end lines, which are claimed pairs' wavelengths", () => {
    expect(withinCoveredRange(407.783, covered)).toBe(true);
    expect(withinCoveredRange(852.144, covered)).toBe(true);
    expect(withinCoveredRange(546.074, covered)).toBe(true);
    // A recalibration's end, worked out through the model, a residual short of its end pair's line.
    expect(withinCoveredRange(852.144, [407.77, 852.1439])).toBe(true);
  });

  it("leaves out the lines beyond either end (pairs fitted but not claimed)", () => {
    expect(withinCoveredRange(394.898, covered)).toBe(false);
    expect(withinCoveredRange(866.794, covered)).toBe(false);
    expect(withinCoveredRange(852.146, covered)).toBe(false);
  });
});
