// The prism's forward model and its numerical inverse, which every prism calibration evaluates through.
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { GLASS_NAMES } from "@/lib/spectrum/calibration/glass-catalogue";
import {
  prismForward,
  prismInverseWavelengths,
  type PrismGeometry,
} from "@/lib/spectrum/calibration/prism-forward";

const DEG = Math.PI / 180;

describe("prismInverseWavelengths", () => {
  it("returns, for the x of every wavelength the forward model passes, that wavelength", () => {
    fc.assert(
      fc.property(
        fc.constantFrom(...GLASS_NAMES),
        // From 55° the densest catalogue glass still passes light at a 60° apex.
        fc.double({ min: 55, max: 75, noNaN: true }),
        fc.double({ min: -0.2, max: 0.2, noNaN: true }),
        fc.constantFrom(1 as const, -1 as const),
        fc.double({ min: 2_000, max: 60_000, noNaN: true }),
        (glass, incidenceDeg, axisAngleRad, direction, focalX) => {
          const geometry: PrismGeometry = {
            glass,
            incidenceRad: incidenceDeg * DEG,
            apexRad: 60 * DEG,
            focalX,
            axisX: 1024,
            direction,
            referenceWavelengthNm: 550,
            axisAngleRad,
          };
          const forward = prismForward(geometry);
          // Every x the model puts a wavelength of 380–1000 nm on comes back to that wavelength.
          const wavelengths = Array.from({ length: 121 }, (_, i) => 380 + 5 * i).filter((nm) =>
            Number.isFinite(forward(nm)),
          );
          // The reference ray (550 nm) passes, so some wavelengths reach the camera.
          expect(wavelengths.length).toBeGreaterThan(0);
          const x = wavelengths.map(forward);
          const found = prismInverseWavelengths(geometry, x);
          found.forEach((lambda, i) => {
            // Double precision of x near 10³–10⁴ px is about 10⁻¹² px; a millionth of a pixel is far
            // below any centre a peak finder gives.
            expect(Math.abs(forward(lambda) - x[i])).toBeLessThan(1e-6);
            expect(Math.abs(lambda - wavelengths[i])).toBeLessThan(1e-6);
          });
        },
      ),
      { numRuns: 60 },
    );
  });

  it("gives NaN for an x the forward model never reaches", () => {
    const geometry: PrismGeometry = {
      glass: "F2",
      incidenceRad: 50 * DEG,
      apexRad: 60 * DEG,
      focalX: 5000,
      axisX: 0,
      direction: 1,
      referenceWavelengthNm: 550,
    };
    const forward = prismForward(geometry);
    // Far beyond either end of the spectrum (its 200–2500 nm span lands within some 10⁴ px).
    const wavelengths = prismInverseWavelengths(geometry, [-1e7, 1e7, forward(600)]);
    expect(Number.isNaN(wavelengths[0])).toBe(true);
    expect(Number.isNaN(wavelengths[1])).toBe(true);
    expect(wavelengths[2]).toBeCloseTo(600, 9);
  });
});
