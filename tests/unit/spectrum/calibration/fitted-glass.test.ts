// A prism of a glass the catalogue does not hold: the prism model with the glass's Sellmeier terms
// fitted from the pairs (fitted-glass.ts, fit-glass-terms.ts) follows it where the best catalogue
// glass cannot, and stays out of the way of a catalogue glass.
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import {
  CalibrationError,
  calibrationUncertainty,
  evaluateCalibration,
  fitCalibration,
  refractiveIndex,
  type CalibrationModel,
} from "@/lib/spectrum/calibration";
import { fittedGlassStart } from "@/lib/spectrum/calibration/fitted-glass";
import { GLASS_NAMES } from "@/lib/spectrum/calibration/glass-catalogue";
import { realisticLamp } from "../../../support/realistic-lamp";

/**
 * Pairs read off the true axis of a generated prism (60° apex at minimum deviation, a camera on a
 * tangent law) of `glass`, 16 of them spread over the array with σ 0.03 px (the centres of a lamp's
 * strong lines; a fitted glass competes only when the catalogue's misses them beyond it), and the largest error of
 * `model` on the whole covered span in units of the calibration's accuracy (0.15 nm, or a tenth of
 * the local FWHM where that is larger).
 */
function prism(seed: number, glass: string, rangeNm: [number, number]) {
  const lamp = realisticLamp(seed, { dispersion: "prism", glass, rangeNm, clean: true });
  const last = lamp.x.length - 1;
  const pairs = Array.from({ length: 16 }, (_, i) => {
    const x = 40 + ((last - 80) * i) / 15;
    return { x, wavelengthNm: lamp.wavelengthAt(x), xUncertainty: 0.03 };
  });
  const worstRatio = (model: CalibrationModel) => {
    const grid = Float64Array.from({ length: 201 }, (_, i) => 40 + ((last - 80) * i) / 200);
    const fitted = evaluateCalibration(model, grid);
    return Math.max(
      ...Array.from(
        grid,
        (x, i) =>
          Math.abs(fitted[i] - lamp.wavelengthAt(x)) / Math.max(0.15, lamp.fwhmNmAt(x) / 10),
      ),
    );
  };
  return { last, pairs, worstRatio };
}

describe("a prism glass fitted from the pairs", () => {
  // SCHOTT's published Sellmeier coefficients of N-LASF9 and N-SF6, and Malitson & Dodge's of
  // sapphire (ordinary ray), none of them in the catalogue, drive the generated prisms (from memory;
  // tests/support/realistic-lamp.ts).
  it.each([
    ["N-LASF9", 11, [380, 950]],
    ["N-SF6", 12, [400, 900]],
    ["sapphire", 13, [320, 840]],
  ] as const)("follows %s, which no catalogue glass does", (glass, seed, range) => {
    const { last, pairs, worstRatio } = prism(seed, glass, [range[0], range[1]]);
    const catalogueOnly = fitCalibration(pairs, {
      model: "prism",
      domain: [0, last],
      fitGlass: false,
      rejectOutliers: false,
    }).model;
    const chosen = fitCalibration(pairs, {
      model: "prism",
      domain: [0, last],
      rejectOutliers: false,
    }).model;
    expect(chosen.kind === "prism" && chosen.glassFitted).toBe(true);
    expect(worstRatio(catalogueOnly)).toBeGreaterThan(0.3);
    expect(worstRatio(chosen)).toBeLessThan(0.2);
    // The stored model is plain JSON and evaluates again, with a finite uncertainty.
    const stored = JSON.parse(JSON.stringify(chosen)) as CalibrationModel;
    const xs = Float64Array.of(100, last / 2, last - 100);
    expect(Array.from(evaluateCalibration(stored, xs))).toEqual(
      Array.from(evaluateCalibration(chosen, xs)),
    );
    for (const sigma of calibrationUncertainty(stored, xs)) expect(sigma).toBeLessThan(0.05);
  });

  it("leaves a catalogue glass's prism to the catalogue", () => {
    const { last, pairs } = prism(14, "SF10", [420, 900]);
    const chosen = fitCalibration(pairs, {
      model: "prism",
      domain: [0, last],
      rejectOutliers: false,
    }).model;
    expect(chosen.kind === "prism" && chosen.glass).toBe("SF10");
    expect(chosen.kind === "prism" && chosen.glassFitted).toBeFalsy();
  });

  it("starts from terms within 0.002 of each catalogue glass's index over the visible (the fit refines them)", () => {
    for (const glass of GLASS_NAMES) {
      const [b1, c1, b3] = fittedGlassStart(glass, [420, 750]);
      for (const nm of [420, 500, 600, 750]) {
        const l2 = (nm / 1000) ** 2;
        const n = Math.sqrt(1 + (b1 * l2) / (l2 - c1) + (b3 * l2) / (l2 - 100));
        expect(Math.abs(n - refractiveIndex(glass, nm))).toBeLessThan(2e-3);
      }
    }
  });

  it("refuses to fit the apex angle and the glass's terms together", () => {
    const { last, pairs } = prism(15, "N-LASF9", [400, 800]);
    expect(() =>
      fitCalibration(pairs, { model: "prism", domain: [0, last], fitGlass: true, fitApex: true }),
    ).toThrow(/cannot both be fitted/);
  });

  it("meets any pairs with a model of finite parameters or a typed error", () => {
    const pair = fc.record({
      x: fc.double({ min: 0, max: 2047, noNaN: true }),
      wavelengthNm: fc.double({ min: 300, max: 1000, noNaN: true }),
      xUncertainty: fc.double({ min: 0.01, max: 3, noNaN: true }),
    });
    fc.assert(
      fc.property(fc.array(pair, { minLength: 9, maxLength: 18 }), (pairs) => {
        try {
          const { model } = fitCalibration(pairs, {
            model: "prism",
            domain: [0, 2047],
            fitGlass: true,
            rejectOutliers: false,
          });
          expect(model.parameters.every(Number.isFinite)).toBe(true);
        } catch (error) {
          expect(error instanceof CalibrationError || error instanceof RangeError).toBe(true);
        }
      }),
      { numRuns: 60, seed: 20261205 },
    );
  });
});
