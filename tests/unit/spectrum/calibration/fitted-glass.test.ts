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
  type FitCalibrationOptions,
} from "@/lib/spectrum/calibration";
import { fittedGlassStart } from "@/lib/spectrum/calibration/fitted-glass";
import { GLASS_NAMES } from "@/lib/spectrum/calibration/glass-catalogue";
import { makeRandom } from "@/lib/spectrum/statistics/make-random";
import { calibrateRealisticLamp, probeErrorRatio } from "../../../support/calibration-sweep";
import { realisticLamp } from "../../../support/realistic-lamp";
import { gaussian } from "./synthetic-lamp";

/**
 * Pairs read off the true axis of a generated prism (60° apex at minimum deviation, a camera on a
 * tangent law) of `glass`, 16 of them spread over the array, each centre off by seeded Gaussian noise
 * of its σ, 0.03 px (the centres of a lamp's strong lines; a fitted glass competes only when the
 * catalogue's misses them beyond it); and the largest error of `model` on the whole covered span in
 * units of the calibration's accuracy (0.15 nm, or a tenth of the local FWHM where that is larger).
 */
function prism(seed: number, glass: string, rangeNm: [number, number]) {
  const lamp = realisticLamp(seed, { dispersion: "prism", glass, rangeNm, clean: true });
  const last = lamp.x.length - 1;
  const random = makeRandom(seed).uniform;
  const pairs = Array.from({ length: 16 }, (_, i) => {
    const x = 40 + ((last - 80) * i) / 15;
    return {
      x: x + 0.03 * gaussian(random),
      wavelengthNm: lamp.wavelengthAt(x),
      xUncertainty: 0.03,
    };
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

/** The prism model of `pairs` on an array of `last + 1` pixels, no outliers rejected. */
function fitPrism(
  pairs: { x: number; wavelengthNm: number; xUncertainty: number }[],
  last: number,
  extra: Partial<FitCalibrationOptions> = {},
) {
  return fitCalibration(pairs, {
    model: "prism",
    domain: [0, last],
    rejectOutliers: false,
    ...extra,
  }).model;
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
    const catalogueOnly = fitPrism(pairs, last, { fitGlass: false });
    const chosen = fitPrism(pairs, last);
    expect(chosen.kind === "prism" && chosen.glassFitted).toBe(true);
    expect(worstRatio(catalogueOnly)).toBeGreaterThan(0.3);
    expect(worstRatio(chosen)).toBeLessThan(0.2);
    // The stored model is plain JSON and evaluates again, with a finite uncertainty.
    const stored = JSON.parse(JSON.stringify(chosen)) as CalibrationModel;
    const xs = Float64Array.of(100, last / 2, last - 100);
    expect(Array.from(evaluateCalibration(stored, xs))).toEqual(
      Array.from(evaluateCalibration(chosen, xs)),
    );
    for (const sigma of calibrationUncertainty(stored, xs)) {
      expect(Number.isFinite(sigma) && sigma > 0).toBe(true);
      expect(sigma).toBeLessThan(0.05);
    }
  });

  it("leaves a catalogue glass's prism to the catalogue", () => {
    const { last, pairs } = prism(14, "SF10", [420, 900]);
    const chosen = fitPrism(pairs, last);
    expect(chosen.kind === "prism" && chosen.glass).toBe("SF10");
    expect(chosen.kind === "prism" && chosen.glassFitted).toBeFalsy();
  });

  // Found on fresh prisms (seed 17200000): an SF10 prism whose two red end pairs are pulled 0.4 and
  // 0.6 nm. Let compete with SF10 whatever its χ², a fitted glass bent onto them and was "paired" 1.4
  // times the accuracy wrong; SF10 fits the pairs within their σ, so no glass is fitted and it is right.
  it("keeps the catalogue glass that fits instrument 17200216's pairs, and with it the right axis", () => {
    const lamp = realisticLamp(17_200_216, { dispersion: "prism" });
    expect(lamp.glass).toBe("SF10");
    const result = calibrateRealisticLamp(lamp);
    expect(result.pairing.status).toBe("paired");
    const model = result.fit!.model;
    expect(model.kind === "prism" && model.glassFitted).toBeFalsy();
    expect(probeErrorRatio(lamp, model).ratio).toBeLessThanOrEqual(1);
  }, 60_000);

  it("refits a stored fitted glass from its own terms to the same minimum", () => {
    const { last, pairs } = prism(16, "N-LASF9", [380, 950]);
    const first = fitPrism(pairs, last);
    expect(first.kind === "prism" && first.glassFitted).toBe(true);
    if (first.kind !== "prism") return;
    const again = fitPrism(pairs, last, {
      glass: first.glass,
      fitGlass: true,
      fittedGlassFrom: first,
    });
    expect(again.chiSquare).toBeLessThanOrEqual(first.chiSquare * 1.001);
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

  it("meets any rising pairs with a model of finite parameters or a CalibrationError", () => {
    // Pairs rising in x and in wavelength (any other order is refused before a prism is fitted), in
    // any spacing, with any σ.
    const rising = (min: number, max: number) =>
      fc
        .uniqueArray(fc.double({ min, max, noNaN: true }), { minLength: 10, maxLength: 18 })
        .map((values) => values.sort((a, b) => a - b));
    let fitted = 0;
    fc.assert(
      fc.property(
        rising(0, 2047),
        rising(350, 900),
        fc.double({ min: 0.01, max: 3, noNaN: true }),
        (xs, wavelengths, sigma) => {
          const n = Math.min(xs.length, wavelengths.length);
          const pairs = xs
            .slice(0, n)
            .map((x, i) => ({ x, wavelengthNm: wavelengths[i], xUncertainty: sigma }));
          let model: CalibrationModel | null = null;
          let caught: unknown = null;
          try {
            model = fitCalibration(pairs, {
              model: "prism",
              domain: [0, 2047],
              fitGlass: true,
              rejectOutliers: false,
            }).model;
          } catch (error) {
            caught = error;
          }
          if (model) {
            fitted++;
            expect(model.parameters.every(Number.isFinite)).toBe(true);
          } else expect(caught).toBeInstanceOf(CalibrationError);
        },
      ),
      { numRuns: 60, seed: 20261205 },
    );
    // Some of the drawn pairings are prisms the model can follow, so both branches ran.
    expect(fitted).toBeGreaterThan(0);
  });
});
