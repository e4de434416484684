// Synthetic calibrations from known dispersion relations: the fits must return the truth, flag bad
// solutions with typed errors, and give uncertainties that behave.
import { describe, it, expect } from "vitest";
import {
  CalibrationError,
  calibrationRangeWarnings,
  calibrationUncertainty,
  compareCalibrationModels,
  dispersionAt,
  evaluateCalibration,
  fitCalibration,
  type CalibrationModel,
} from "@/lib/spectrum/calibration";
import { prismForwardX } from "@/lib/spectrum/calibration/prism-forward";
import { makeRandom } from "@/lib/spectrum/statistics/make-random";
import { HG_NE_AR_LINES, NEON_LINES } from "./lamp-lines";
import { gaussian } from "./synthetic-lamp";

const DOMAIN: [number, number] = [0, 2047];
// A grating with a cubic dispersion term: λ(x) = 350 + 0.27x + 2e-6·(x − 1000)² − 4e-10·(x − 1000)³.
const gratingNm = (x: number) => 350 + 0.27 * x + 2e-6 * (x - 1000) ** 2 - 4e-10 * (x - 1000) ** 3;
function gratingX(lambda: number): number {
  let x = (lambda - 350) / 0.27;
  for (let i = 0; i < 50; i++)
    x -= (gratingNm(x) - lambda) / (0.27 + 4e-6 * (x - 1000) - 1.2e-9 * (x - 1000) ** 2);
  return x;
}

/** A prism of F2 scaled so that 350–900 nm fills the array. */
function prismTruth(direction: 1 | -1 = 1) {
  const base = {
    glass: "F2" as const,
    incidenceRad: (52 * Math.PI) / 180,
    apexRad: Math.PI / 3,
    direction: 1 as const,
    referenceWavelengthNm: 550,
  };
  const raw = (l: number) => prismForwardX({ ...base, focalX: 1, axisX: 0 }, l);
  const focalX = 2000 / (raw(900) - raw(350));
  const geometry = { ...base, focalX, axisX: 20 - focalX * raw(350) };
  return (l: number) =>
    direction === 1 ? prismForwardX(geometry, l) : 2047 - prismForwardX(geometry, l);
}

function pairsFrom(lines: number[], xOf: (l: number) => number, noiseX: number, seed: number) {
  const random = makeRandom(seed).uniform;
  return lines.map((wavelengthNm) => ({
    x: xOf(wavelengthNm) + noiseX * gaussian(random),
    xUncertainty: noiseX,
    wavelengthNm,
  }));
}

const lampNm = HG_NE_AR_LINES.map((l) => l.wavelengthNm).filter((l) => l > 352 && l < 890);

describe("fitCalibration: polynomial (grating)", () => {
  it("recovers a cubic grating within 0.02 nm at chosen pixels and the 1σ covers the truth", () => {
    const pairs = pairsFrom(
      lampNm.filter((_, i) => i % 2 === 0),
      gratingX,
      0.05,
      11,
    );
    const { model, rmsNm, dof } = fitCalibration(pairs, { degree: 3, domain: DOMAIN });
    expect(dof).toBe(pairs.length - 4);
    // 0.05 px noise × 0.27 nm/px ≈ 0.014 nm per pair: the RMS must be of that order.
    expect(rmsNm).toBeLessThan(0.03);
    const x = new Float64Array([100, 500, 1000, 1500, 1900]);
    const lambda = evaluateCalibration(model, x);
    const sigma = calibrationUncertainty(model, x);
    let covered = 0;
    x.forEach((xi, i) => {
      expect(Math.abs(lambda[i] - gratingNm(xi))).toBeLessThan(0.02);
      if (Math.abs(lambda[i] - gratingNm(xi)) < 2 * sigma[i]) covered++;
    });
    expect(covered).toBeGreaterThanOrEqual(4);
    const dispersion = dispersionAt(model, x);
    x.forEach((xi, i) =>
      expect(Math.abs(dispersion[i] - (gratingNm(xi + 0.5) - gratingNm(xi - 0.5)))).toBeLessThan(
        1e-3,
      ),
    );
  });

  it("the 2σ band covers the truth in most of 40 noise draws", () => {
    let covered = 0;
    let total = 0;
    for (let seed = 1; seed <= 40; seed++) {
      const pairs = pairsFrom(lampNm, gratingX, 0.1, seed);
      const { model } = fitCalibration(pairs, { degree: 3, domain: DOMAIN, rejectOutliers: false });
      const x = new Float64Array([300, 1200]);
      const lambda = evaluateCalibration(model, x);
      const sigma = calibrationUncertainty(model, x);
      x.forEach((xi, i) => {
        total++;
        if (Math.abs(lambda[i] - gratingNm(xi)) < 2 * sigma[i]) covered++;
      });
    }
    // 2σ covers ~95 % of a Gaussian; allow sampling scatter down to 85 %.
    expect(covered / total).toBeGreaterThan(0.85);
  });

  it("rejects a mis-paired line as an outlier and keeps the rest", () => {
    const pairs = pairsFrom(lampNm, gratingX, 0.05, 5);
    pairs[7] = { ...pairs[7], wavelengthNm: pairs[7].wavelengthNm + 1.5 };
    const result = fitCalibration(pairs, { degree: 3, domain: DOMAIN });
    expect(result.rejected.map((p) => p.wavelengthNm)).toEqual([pairs[7].wavelengthNm]);
    expect(result.pairs[7].used).toBe(false);
    expect(result.rmsNm).toBeLessThan(0.03);
    expect(result.warnings.some((w) => w.code === "outliers-rejected")).toBe(true);
  });

  it("says how many pairs a model needs", () => {
    const pairs = pairsFrom([400, 500, 600, 700], gratingX, 0.05, 1);
    try {
      fitCalibration(pairs, { degree: 4, domain: DOMAIN });
      expect.unreachable();
    } catch (error) {
      expect(error).toBeInstanceOf(CalibrationError);
      expect((error as CalibrationError).code).toBe("too-few-pairs");
      expect((error as CalibrationError).details).toEqual({ needed: 6, given: 4 });
    }
  });

  it("throws the typed non-monotonic error for a polynomial that turns back on the array", () => {
    // Pairs on the first half only, with a strong curvature: a quadratic through them has its vertex
    // inside the array, so λ(x) turns back before xMax.
    const pairs = [0, 100, 200, 300, 400, 500, 600].map((x) => ({
      x,
      wavelengthNm: 400 + 0.5 * x - 0.0004 * x * x,
    }));
    expect(() => fitCalibration(pairs, { degree: 2, domain: DOMAIN })).toThrowError(
      expect.objectContaining({ code: "non-monotonic" }),
    );
  });
});

describe("calibrationUncertainty", () => {
  it("grows in a gap and beyond a neon-like set with nothing in the blue, and the model warns there", () => {
    const neonNm = NEON_LINES.map((l) => l.wavelengthNm).filter((l) => l < 760 || l > 830);
    const pairs = pairsFrom(neonNm, gratingX, 0.05, 2);
    const { model } = fitCalibration(pairs, { degree: 3, domain: DOMAIN });
    const blue = gratingX(400);
    const dense = gratingX(640);
    const gap = gratingX(795);
    const sigma = calibrationUncertainty(model, new Float64Array([blue, dense, gap]));
    expect(sigma[0]).toBeGreaterThan(10 * sigma[1]);
    expect(sigma[2]).toBeGreaterThan(1.5 * sigma[1]);
    const warnings: string[] = [];
    evaluateCalibration(model, new Float64Array([blue, dense]), {
      onWarning: (w) => warnings.push(...w.map((x) => x.code)),
    });
    expect(warnings).toEqual(["outside-covered-range"]);
    expect(calibrationRangeWarnings(model, new Float64Array([dense]))).toEqual([]);
  });
});

describe("fitCalibration: prism", () => {
  const truth = prismTruth();
  const pairs = pairsFrom(
    lampNm.filter((_, i) => i % 3 === 0),
    truth,
    0.05,
    9,
  );
  const x = new Float64Array([30, 400, 1000, 1600, 2000]);
  const trueNm = (xi: number) => {
    let low = 300;
    let high = 1000;
    for (let i = 0; i < 80; i++) {
      const mid = (low + high) / 2;
      if (truth(mid) < xi) low = mid;
      else high = mid;
    }
    return (low + high) / 2;
  };

  it("the physical model finds the glass and recovers λ within 0.05 nm across the array", () => {
    const { model } = fitCalibration(pairs, { model: "prism", domain: DOMAIN });
    expect(model.kind === "prism" && model.glass).toBe("F2");
    const lambda = evaluateCalibration(model, x);
    x.forEach((xi, i) => expect(Math.abs(lambda[i] - trueNm(xi))).toBeLessThan(0.05));
    // A stored model is plain JSON and evaluates the same after a round trip.
    const stored = JSON.parse(JSON.stringify(model)) as CalibrationModel;
    expect(Array.from(evaluateCalibration(stored, x))).toEqual(Array.from(lambda));
  });

  it("represents a prism whose camera looks off the pairs' middle ray exactly, and its σ covers the truth", () => {
    // The generator's camera is centred on 550 nm, the fit's reference ray is the pairs' middle (≈ 625 nm).
    const exactPairs = pairsFrom(
      lampNm.filter((_, i) => i % 3 === 0),
      truth,
      0,
      1,
    ).map((p) => ({ ...p, xUncertainty: 0.05 }));
    const fitted = fitCalibration(exactPairs, {
      model: "prism",
      glass: "F2",
      domain: DOMAIN,
      rejectOutliers: false,
    });
    const model = fitted.model;
    expect(model.kind === "prism" && model.axisAngleFitted).toBe(true);
    expect(model.parameterNames).toEqual(["incidenceRad", "focalX", "axisX", "axisAngleRad"]);
    // Noise-free pairs of the model's own form: the residual is round-off, not a model bias.
    expect(fitted.rmsNm).toBeLessThan(1e-6);
    const lambda = evaluateCalibration(model, x);
    x.forEach((xi, i) => expect(Math.abs(lambda[i] - trueNm(xi))).toBeLessThan(1e-4));
    // The camera centred on the middle ray (the model before the axis angle) cannot follow it.
    const centred = fitCalibration(exactPairs, {
      model: "prism",
      glass: "F2",
      domain: DOMAIN,
      rejectOutliers: false,
      fitAxisAngle: false,
    });
    expect(centred.rmsNm).toBeGreaterThan(1e-3);
    // On noisy pairs the truth lies within 4σ of the calibration everywhere, the extrapolated ends too.
    const noisy = fitCalibration(pairs, {
      model: "prism",
      glass: "F2",
      domain: DOMAIN,
      rejectOutliers: false,
    }).model;
    const across = new Float64Array([0, 30, 400, 1000, 1600, 2000, 2047]);
    const noisyNm = evaluateCalibration(noisy, across);
    const sigma = calibrationUncertainty(noisy, across);
    across.forEach((xi, i) => expect(Math.abs(noisyNm[i] - trueNm(xi))).toBeLessThan(4 * sigma[i]));
  });

  it("evaluates a stored prism model without the axis angle as a camera centred on its reference ray", () => {
    const { model } = fitCalibration(pairs, {
      model: "prism",
      glass: "F2",
      domain: DOMAIN,
      fitAxisAngle: false,
    });
    if (model.kind !== "prism") throw new Error("expected a prism model");
    expect(model.axisAngleFitted).toBeUndefined();
    expect(model.parameters).toHaveLength(3);
    const [incidenceRad, focalX, axisX] = model.parameters;
    const geometry = {
      glass: model.glass,
      incidenceRad,
      focalX,
      axisX,
      apexRad: Math.PI / 3,
      direction: model.direction,
      referenceWavelengthNm: model.referenceWavelengthNm,
    };
    const lambda = evaluateCalibration(model, x);
    lambda.forEach((l, i) =>
      expect(Math.abs(prismForwardX(geometry, l) - x[i])).toBeLessThan(1e-6),
    );
  });

  it("Hartmann follows the prism far better than a cubic polynomial", () => {
    const hartmann = fitCalibration(pairs, {
      model: "hartmann",
      domain: DOMAIN,
      rejectOutliers: false,
    });
    const cubic = fitCalibration(pairs, {
      model: "polynomial",
      degree: 3,
      domain: DOMAIN,
      rejectOutliers: false,
    });
    expect(hartmann.rmsNm).toBeLessThan(cubic.rmsNm / 3);
  });

  it("compareCalibrationModels lists the candidates with their ends and recommends a prism-shaped one", () => {
    const result = compareCalibrationModels(pairs, { dispersion: "prism", domain: DOMAIN });
    expect(result.candidates.map((c) => c.kind)).toEqual([
      "polynomial",
      "polynomial",
      "polynomial",
      "polynomial",
      "polynomial",
      "hartmann",
      "prism",
    ]);
    const recommended = result.candidates[result.recommended];
    expect(recommended.kind).not.toBe("polynomial");
    for (const c of result.candidates.filter((c) => c.model)) {
      expect(c.ends).toHaveLength(2);
      expect(Number.isFinite(c.aicc)).toBe(true);
    }
  });
});

describe("compareCalibrationModels: grating", () => {
  it("recommends the lowest polynomial degree within ΔAICc ≤ 2 — not degree 1 for a cubic grating", () => {
    const pairs = pairsFrom(lampNm, gratingX, 0.05, 3);
    const result = compareCalibrationModels(pairs, { dispersion: "grating", domain: DOMAIN });
    const recommended = result.candidates[result.recommended];
    expect(recommended.kind).toBe("polynomial");
    expect(recommended.degree).toBeGreaterThanOrEqual(3);
    const best = Math.min(
      ...result.candidates
        .filter((c) => c.kind === "polynomial" && c.aicc !== undefined)
        .map((c) => c.aicc!),
    );
    expect(recommended.aicc! - best).toBeLessThanOrEqual(2);
  });
});
