// Checks the Sellmeier catalogue against the glass makers' published refractive indices.
import { describe, it, expect } from "vitest";
import { refractiveIndex, GLASS_NAMES } from "@/lib/spectrum/calibration";

describe("refractiveIndex", () => {
  it("reproduces the SCHOTT data sheet indices of N-BK7 at d, F and C", () => {
    // SCHOTT N-BK7 data sheet: n_d = 1.51680 at 587.56 nm (from memory)
    expect(refractiveIndex("N-BK7", 587.5618)).toBeCloseTo(1.5168, 4.7);
    // SCHOTT N-BK7 data sheet: n_F = 1.52238 at 486.13 nm (from memory)
    expect(Math.abs(refractiveIndex("N-BK7", 486.1327) - 1.52238)).toBeLessThan(2e-5);
    // SCHOTT N-BK7 data sheet: n_C = 1.51432 at 656.27 nm (from memory)
    expect(Math.abs(refractiveIndex("N-BK7", 656.2725) - 1.51432)).toBeLessThan(2e-5);
  });

  it("reproduces n_d of the flints and of fused silica", () => {
    // SCHOTT N-SF11 data sheet: n_d = 1.78472 (from memory)
    expect(Math.abs(refractiveIndex("N-SF11", 587.5618) - 1.78472)).toBeLessThan(1e-5);
    // SCHOTT F2 data sheet: n_d = 1.62004 (from memory)
    expect(Math.abs(refractiveIndex("F2", 587.5618) - 1.62004)).toBeLessThan(1e-5);
    // SCHOTT N-SF10 data sheet: n_d = 1.72828 (from memory)
    expect(Math.abs(refractiveIndex("N-SF10", 587.5618) - 1.72828)).toBeLessThan(2e-5);
    // SCHOTT N-SK16 data sheet: n_d = 1.62041 (from memory)
    expect(Math.abs(refractiveIndex("N-SK16", 587.5618) - 1.62041)).toBeLessThan(2e-5);
    // Malitson 1965 fused silica: n = 1.45846 at 587.6 nm (from memory)
    expect(Math.abs(refractiveIndex("fused-silica", 587.5618) - 1.45846)).toBeLessThan(2e-5);
  });

  it("disperses blue more than red in every glass (normal dispersion)", () => {
    for (const glass of GLASS_NAMES) {
      const blue = refractiveIndex(glass, 400.5) - refractiveIndex(glass, 400);
      const red = refractiveIndex(glass, 800.5) - refractiveIndex(glass, 800);
      expect(blue).toBeLessThan(0);
      expect(Math.abs(blue)).toBeGreaterThan(3 * Math.abs(red));
    }
  });

  it("rejects a non-positive wavelength and an unknown glass", () => {
    expect(() => refractiveIndex("N-BK7", 0)).toThrow(RangeError);
    expect(() => refractiveIndex("NOPE" as never, 500)).toThrow(RangeError);
  });
});
