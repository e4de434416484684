// The fast forward prism fit and the glass ensemble built on it, on pairs made by a known F2 prism:
// the right glass comes back and extrapolates into the blue; the ensemble's spread is wide where the
// pairs do not pin the glass and narrow where they do.
import { describe, it, expect } from "vitest";
import { fitForwardPrism } from "@/lib/spectrum/calibration/fit-forward-prism";
import { fitGlassEnsemble } from "@/lib/spectrum/calibration/fit-glass-ensemble";
import { prismForwardX } from "@/lib/spectrum/calibration/prism-forward";
import { makeRandom } from "@/lib/spectrum/statistics/make-random";
import { HG_NE_AR_LINES as LINES } from "./lamp-lines";
import { gaussian } from "./synthetic-lamp";

const F2 = {
  glass: "F2" as const,
  incidenceRad: (52 * Math.PI) / 180,
  apexRad: Math.PI / 3,
  direction: 1 as const,
  referenceWavelengthNm: 550,
};
const rawPrism = (l: number) => prismForwardX({ ...F2, focalX: 1, axisX: 0 }, l);
const prismScale = 2000 / (rawPrism(900) - rawPrism(350));
const prismX = (l: number) => 20 + prismScale * (rawPrism(l) - rawPrism(350));
const NOISE_X = 0.05;

/** Pairs of the lines inside [lowNm, highNm] with the true x plus 0.05 px noise (none when noise is 0). */
function pairs(lowNm: number, highNm: number, noiseX = NOISE_X) {
  const random = makeRandom(1).uniform;
  return LINES.filter((l) => l.wavelengthNm >= lowNm && l.wavelengthNm <= highNm).map((l) => ({
    x: prismX(l.wavelengthNm) + noiseX * gaussian(random),
    xUncertainty: NOISE_X,
    wavelengthNm: l.wavelengthNm,
  }));
}

describe("fitForwardPrism", () => {
  it("fits pairs of its own glass to the noise and extrapolates into the blue within its σ", () => {
    const fit = fitForwardPrism(pairs(540, 900), "F2");
    expect(fit.glass).toBe("F2");
    // χ² of a correct model is about its degrees of freedom; 3× allows for the noise draw.
    expect(fit.chiSquare).toBeLessThan(3 * fit.dof);
    // 365 nm lies 250 px beyond the bluest pair, where 0.05 px of noise grows to about 1 px.
    expect(Math.abs(fit.predictX(365.015) - prismX(365.015))).toBeLessThan(
      3 * fit.predictionSigmaX(365.015, 0),
    );
  });

  it("fits noise-free pairs of its own glass exactly, wherever its camera looks", () => {
    // The pairs' middle ray (720 nm) is the fit's reference, the generator's camera looks along 550 nm:
    // with the axis angle fitted the model is the generator's and extrapolates exactly.
    const fit = fitForwardPrism(pairs(540, 900, 0), "F2");
    expect(fit.parameters).toHaveLength(4);
    expect(Math.abs(fit.predictX(365.015) - prismX(365.015))).toBeLessThan(1e-3);
    // A camera pinned to the 720 nm ray bends the far blue by most of a pixel.
    const centred = fitForwardPrism(pairs(540, 900, 0), "F2", { fitAxisAngle: false });
    expect(Math.abs(centred.predictX(365.015) - prismX(365.015))).toBeGreaterThan(0.1);
    // Taken at the generator's own axis wavelength, the centred model is the generator's too.
    const exact = fitForwardPrism(pairs(540, 900, 0), "F2", {
      referenceWavelengthNm: 550,
      fitAxisAngle: false,
    });
    expect(Math.abs(exact.predictX(365.015) - prismX(365.015))).toBeLessThan(1e-3);
  });

  it("finds the same geometry from an earlier fit's incidence, near or far off", () => {
    const all = pairs(350, 900);
    const scratch = fitForwardPrism(all, "F2", { fitAxisAngle: false });
    for (const offsetDeg of [0.7, -2.2, 20]) {
      const started = fitForwardPrism(all, "F2", {
        fitAxisAngle: false,
        startIncidenceRad: scratch.parameters[0] + (offsetDeg * Math.PI) / 180,
      });
      expect(started.parameters[0]).toBeCloseTo(scratch.parameters[0], 7);
      expect(started.chiSquare).toBeCloseTo(scratch.chiSquare, 6);
    }
  });

  it("fits a crown glass to flint pairs far worse than the flint", () => {
    const all = pairs(350, 900);
    expect(fitForwardPrism(all, "N-BK7").chiSquare).toBeGreaterThan(
      100 * fitForwardPrism(all, "F2").chiSquare,
    );
  });

  it("refuses fewer pairs than parameters + 1", () => {
    expect(() => fitForwardPrism(pairs(540, 900).slice(0, 4), "F2")).toThrow(RangeError);
    expect(() =>
      fitForwardPrism(pairs(540, 900).slice(0, 3), "F2", { fitAxisAngle: false }),
    ).toThrow(RangeError);
  });
});

describe("fitGlassEnsemble", () => {
  it("keeps the true glass, and its spread covers the true x of a far-blue line", () => {
    const ensemble = fitGlassEnsemble(pairs(540, 900))!;
    expect(ensemble.fits.map((f) => f.glass)).toContain("F2");
    const error = Math.abs(ensemble.predictX(365.015) - prismX(365.015));
    expect(error).toBeLessThan(3 * ensemble.predictionSigmaX(365.015, NOISE_X));
  });

  it("narrows in the blue once pairs there pin the glass", () => {
    const redOnly = fitGlassEnsemble(pairs(580, 900))!;
    const wide = fitGlassEnsemble(pairs(400, 900))!;
    expect(wide.predictionSigmaX(365.015, NOISE_X)).toBeLessThan(
      redOnly.predictionSigmaX(365.015, NOISE_X),
    );
    // Pinned over 400–900 nm, 365.015 and 366.328 nm (20 px apart) are told apart many times over.
    expect(3 * wide.predictionSigmaX(365.015, NOISE_X)).toBeLessThan(2);
    expect(Math.abs(wide.predictX(365.015) - prismX(365.015))).toBeLessThan(1);
  });

  it("leaves out, without a fit, the glasses whose χ² over fewer of the pairs already rules them out", () => {
    const all = pairs(540, 900);
    // Every other pair between the end pairs: the same range, so the same reference ray and model.
    const fewer = all.filter((_, i) => i === 0 || i === all.length - 1 || i % 2 === 0);
    expect(fewer.length).toBeLessThan(all.length);
    const first = fitGlassEnsemble(fewer, { fitAxisAngle: false })!;
    // Adding pairs to one model never lowers its least-squares minimum: each glass's χ² over the
    // fewer pairs is a floor of its χ² over all of them.
    const whole = fitGlassEnsemble(all, { fitAxisAngle: false })!;
    expect(whole.chiSquares.size).toBeGreaterThan(3);
    for (const [glass, chiSquare] of first.chiSquares) {
      if (whole.chiSquares.has(glass))
        expect(whole.chiSquares.get(glass)!).toBeGreaterThanOrEqual(chiSquare * (1 - 1e-9));
    }
    const floored = fitGlassEnsemble(all, {
      fitAxisAngle: false,
      chiSquareFloors: first.chiSquares,
      incidenceStarts: new Map(),
    })!;
    // The same kept glasses and predictions, with fewer glasses fitted.
    expect(floored.fits.map((f) => f.glass)).toEqual(whole.fits.map((f) => f.glass));
    expect(floored.predictX(365.015)).toBeCloseTo(whole.predictX(365.015), 6);
    expect(floored.bestAicc).toBeCloseTo(whole.bestAicc, 9);
    // A glass left out keeps its floor as its χ² (a fit of all the pairs would have raised it).
    const leftOut = [...floored.chiSquares]
      .filter(([glass, chiSquare]) => chiSquare === first.chiSquares.get(glass))
      .map(([glass]) => glass);
    // The crowns already miss F2's pairs by far.
    expect(leftOut.length).toBeGreaterThan(0);
    expect(leftOut).not.toContain("F2");
  });

  it("refuses a negative ΔAICc", () => {
    expect(() => fitGlassEnsemble(pairs(540, 900), { maxDeltaAicc: -1 })).toThrow(RangeError);
  });
});
