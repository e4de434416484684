// Checks our polynomial and Hartmann fits against NumPy polyfit and SciPy curve_fit, and the top of a
// blend of lamp lines against SciPy's bounded scalar minimiser, and each pair's held-out miss against
// NumPy polyfit of the other pairs, and the prism with a fitted glass against SciPy's least_squares (see
// tests/reference).
import { describe, it, expect } from "vitest";
import reference from "../../../reference/calibration-reference.json";
import { evaluateCalibration, fitCalibration } from "@/lib/spectrum/calibration";
import { fitForwardHartmann } from "@/lib/spectrum/calibration/fit-forward-hartmann";
import { blendTop } from "@/lib/spectrum/calibration/group-blended-lamp-lines";
import { worstHeldOutMiss } from "@/lib/spectrum/calibration/held-out-miss";
import { PAIRING_CHECK_LIMITS } from "@/lib/spectrum/calibration/verify-lamp-pairing";

const domain = reference.domain as [number, number];

/** The Hartmann fit of a reference's pairs, equally weighted as curve_fit weighs them without sigma. */
function uniformHartmann(h: { x: number[]; wavelengthNm: number[] }) {
  const pairs = h.x.map((x, i) => ({ x, wavelengthNm: h.wavelengthNm[i] }));
  return fitCalibration(pairs, {
    model: "hartmann",
    domain,
    weighting: "uniform",
    rejectOutliers: false,
  }).model;
}

describe("fits against NumPy/SciPy reference values", () => {
  for (const expected of reference.polynomial.fits) {
    it(`degree-${expected.degree} polynomial matches numpy.polyfit(cov=True)`, () => {
      const pairs = reference.polynomial.x.map((x, i) => ({
        x,
        wavelengthNm: reference.polynomial.wavelengthNm[i],
      }));
      const { model } = fitCalibration(pairs, {
        degree: expected.degree,
        domain,
        weighting: "uniform",
        rejectOutliers: false,
      });
      expected.coefficientsAscending.forEach((c, k) => {
        // NumPy 1.24.2 numpy.polyfit coefficients: agree within 1e-9 relative to the largest (276 nm)
        expect(Math.abs(model.parameters[k] - c)).toBeLessThan(1e-9 * 300);
      });
      expected.covarianceAscending.forEach((row, a) =>
        row.forEach((value, b) => {
          // NumPy 1.24.2 numpy.polyfit(cov=True) covariance: within 1e-6 relative
          expect(Math.abs(model.covariance[a][b] - value)).toBeLessThanOrEqual(
            1e-6 * Math.abs(value) + 1e-15,
          );
        }),
      );
      const predicted = evaluateCalibration(model, new Float64Array(expected.evalX));
      // NumPy 1.24.2 numpy.polyval predictions: within 1e-8 nm
      expected.evalNm.forEach((value, i) =>
        expect(Math.abs(predicted[i] - value)).toBeLessThan(1e-8),
      );
    });
  }

  it("Hartmann fit matches scipy.optimize.curve_fit parameters and covariance", () => {
    const h = reference.hartmann;
    const model = uniformHartmann(h);
    expect(model.kind).toBe("hartmann");
    h.parameters.forEach((value, k) => {
      // SciPy 1.10.1 curve_fit parameters: within 1e-5 relative (both stop at their own tolerances)
      expect(Math.abs(model.parameters[k] - value)).toBeLessThan(1e-5 * Math.abs(value));
    });
    h.covariance.forEach((row, a) =>
      row.forEach((value, b) => {
        // SciPy 1.10.1 curve_fit covariance (absolute_sigma=False): within 1 % of each entry's scale
        const scale = Math.sqrt(Math.abs(h.covariance[a][a] * h.covariance[b][b]));
        expect(Math.abs(model.covariance[a][b] - value)).toBeLessThan(0.01 * scale);
      }),
    );
  });

  it("Hartmann fit reaches SciPy's least-squares minimum on a steep curve with correlated parameters", () => {
    const h = reference.hartmannSteep;
    const model = uniformHartmann(h);
    const fitted = evaluateCalibration(model, new Float64Array(h.x));
    const chiSquare = h.wavelengthNm.reduce((sum, y, i) => sum + (y - fitted[i]) ** 2, 0);
    // SciPy 1.10.1 curve_fit (ftol = xtol = gtol = 1e-15) χ²: ours within 1e-8 relative (a four-parameter
    // Levenberg–Marquardt stopped at its iteration cap 10⁶–10⁹ times above it on such curves)
    expect(Math.abs(chiSquare - h.chiSquare)).toBeLessThan(1e-8 * h.chiSquare);
    h.parameters.forEach((value, k) => {
      // SciPy 1.10.1 curve_fit parameters: within 1e-5 relative
      expect(Math.abs(model.parameters[k] - value)).toBeLessThan(1e-5 * Math.abs(value));
    });
  });

  it("the prism pairing's forward Hartmann fit reaches SciPy's weighted minimum, with its covariance", () => {
    const h = reference.forwardHartmann;
    const fit = fitForwardHartmann(
      h.x.map((x, i) => ({ x, wavelengthNm: h.wavelengthNm[i], xUncertainty: h.xUncertainty[i] })),
    );
    // SciPy 1.10.1 curve_fit (sigma, absolute_sigma=True, ftol = xtol = gtol = 1e-15) χ²: within 1e-8
    expect(Math.abs(fit.chiSquare - h.chiSquare)).toBeLessThan(1e-8 * h.chiSquare);
    h.parameters.forEach((value, k) => {
      // SciPy 1.10.1 curve_fit parameters: within 1e-5 relative
      expect(Math.abs(fit.parameters[k] - value)).toBeLessThan(1e-5 * Math.abs(value));
    });
    // The prediction's σ from SciPy's covariance, scaled as the fit documents (s² = max(1, χ²/dof)).
    const [, b, lambda0, alpha] = h.parameters;
    const s2 = Math.max(1, h.chiSquare / (h.x.length - 4));
    for (const nm of [420, 560, 700, 840]) {
      const base = (nm - lambda0) / 100;
      const u = base ** -alpha;
      const g = [1, u, (b * alpha * u) / base / 100, -b * u * Math.log(base)];
      let variance = 0;
      for (let j = 0; j < 4; j++)
        for (let k = 0; k < 4; k++) variance += g[j] * h.covariance[j][k] * g[k];
      // SciPy 1.10.1 curve_fit covariance carried to x: within 1 %
      expect(fit.predictionSigmaX(nm, 0) / Math.sqrt(s2 * variance)).toBeCloseTo(1, 2);
    }
  });

  for (const blend of reference.blendTops) {
    it(`puts the top of lines at ${blend.wavelengthsNm.join(", ")} nm (FWHM ${blend.fwhmNm} nm) where SciPy finds the summed profile's maximum`, () => {
      // SciPy 1.10.1 optimize.minimize_scalar (bounded, xatol 1e-10) on the negated sum of Gaussians.
      expect(
        Math.abs(blendTop(blend.wavelengthsNm, blend.intensities, blend.fwhmNm) - blend.topNm),
      ).toBeLessThan(1e-6);
    });
  }

  it("holds each pair of a weighted cubic to where NumPy's polyfit of the others puts it", () => {
    const h = reference.heldOut;
    const pairs = h.x.map((x, i) => ({
      x,
      wavelengthNm: h.wavelengthNm[i],
      xUncertainty: h.xUncertainty[i],
      peakIndex: i,
      lineIndex: i,
    }));
    const { model } = fitCalibration(pairs, {
      model: "polynomial",
      degree: 3,
      domain,
      rejectOutliers: false,
    });
    const worstExpected = Math.max(...h.sigmas);
    expect(h.sigmas.indexOf(worstExpected)).toBe(h.pulledIndex);
    // The linearisation alone (no pair screened for a refit) and exact refits of every pair agree for
    // a polynomial.
    for (const screen of [Infinity, -Infinity]) {
      const worst = worstHeldOutMiss(pairs, model, domain, h.centreFloorX, screen);
      expect(worst?.pair.peakIndex).toBe(h.pulledIndex);
      // NumPy 1.24.2 polyfit (weights 1/σλ, cov=True) of the other pairs: within 1 % (NumPy weighs by
      // the generating cubic's slope, the fit by its own).
      expect(worst!.sigmas / worstExpected).toBeCloseTo(1, 2);
    }
    // The pulled pair (0.3 nm, about a pixel) fails the check; every other pair passes it.
    expect(worstExpected).toBeGreaterThan(PAIRING_CHECK_LIMITS.maxHeldOutMiss);
    const others = h.sigmas.filter((_, i) => i !== h.pulledIndex);
    expect(Math.max(...others)).toBeLessThan(PAIRING_CHECK_LIMITS.maxHeldOutMiss);
  });

  // SciPy's least_squares on the prism model with its glass's terms fitted (one ultraviolet resonance
  // and an infrared strength at 100 µm²), the pairs made from SCHOTT's N-LASF9 (from memory), a glass
  // outside the catalogue: our fit, started from N-SF11, reaches the same minimum and the same axis.
  it("prism with a fitted glass reaches SciPy's least-squares minimum, on its axis", () => {
    const g = reference.fittedGlassPrism;
    const pairs = g.x.map((x, i) => ({
      x,
      wavelengthNm: g.wavelengthNm[i],
      xUncertainty: g.xUncertainty[i],
    }));
    const model = fitCalibration(pairs, {
      model: "prism",
      glass: "N-SF11",
      fitGlass: true,
      apexDeg: g.apexDeg,
      domain: [0, 2100],
      rejectOutliers: false,
    }).model;
    expect(model.kind === "prism" && model.glassFitted).toBe(true);
    // SciPy converged (status > 0) inside the bounds our search keeps to, and our search reaches its
    // χ² to 0.1 %. The incidence and the glass's strength trade off along a flat valley (SciPy's
    // minimum lies at a grazing incidence, 89.9°), so two points of equal χ² may still part slightly
    // between the pairs: the axes agree to 0.003 nm, a fiftieth of a prism calibration's accuracy.
    expect(g.status).toBeGreaterThan(0);
    expect(Math.abs(model.chiSquare / g.chiSquare - 1)).toBeLessThan(0.001);
    const ours = evaluateCalibration(model, Float64Array.from(g.evalX));
    g.evalNm.forEach((nm, i) => expect(Math.abs(ours[i] - nm)).toBeLessThan(0.003));
  });
});
