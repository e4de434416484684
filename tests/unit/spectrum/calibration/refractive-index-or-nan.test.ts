// The prism model's non-throwing index: the catalogue value where the Sellmeier formula holds, NaN
// beyond a resonance or for a wavelength that is no wavelength (refractiveIndex throws there instead).
import { describe, expect, it } from "vitest";
import { CalibrationError, GLASS_CATALOGUE, refractiveIndex } from "@/lib/spectrum/calibration";
import { refractiveIndexOrNaN } from "@/lib/spectrum/calibration/refractive-index-or-nan";

describe("refractiveIndexOrNaN", () => {
  it("gives the glass maker's nd for N-BK7 and the same value as refractiveIndex", () => {
    // SCHOTT N-BK7 data sheet: nd = 1.51680 at the helium d line, 587.56 nm (from memory).
    expect(refractiveIndexOrNaN(GLASS_CATALOGUE["N-BK7"], 587.5618)).toBeCloseTo(1.5168, 4);
    for (const nm of [350, 486.1, 656.3, 900]) {
      expect(refractiveIndexOrNaN(GLASS_CATALOGUE["N-SF11"], nm)).toBe(
        refractiveIndex("N-SF11", nm),
      );
    }
  });

  it("is NaN beyond a resonance, where refractiveIndex throws not-invertible", () => {
    // N-SF11's ultraviolet resonance lies near 250 nm (its C₃ term).
    expect(refractiveIndexOrNaN(GLASS_CATALOGUE["N-SF11"], 200)).toBeNaN();
    expect(() => refractiveIndex("N-SF11", 200)).toThrow(CalibrationError);
    for (const bad of [0, -5, Number.NaN, Number.POSITIVE_INFINITY]) {
      expect(refractiveIndexOrNaN(GLASS_CATALOGUE["N-BK7"], bad)).toBeNaN();
    }
  });
});
