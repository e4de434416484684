// How far each pair falls from the calibration refitted without it, in units of what that prediction
// and the pair's own centre allow: |λ − λ̂₋ᵢ(x)| / √(σλ̂₋ᵢ(x)² + (σx·dλ/dx)²). The model is the final
// one (its kind, degree, glass and fitted angles), so the miss is judged with the shape that will be
// used; the prediction's σ (from the covariance of the fit without the pair, scaled by its residuals)
// is small between close neighbours and large in a gap or beyond the ends. A wrong pair that the
// model bent onto in a gap between lamp lines (an unlisted line taken for a listed one 0.3 FWHM away,
// which a Hartmann curve of nine pairs follows) falls many σ from the others' curve; a right one
// within a few. The deleted residual is the regression diagnostic of Belsley, Kuh & Welsch,
// Regression Diagnostics (1980; cited from memory). Unlike their externally studentised residual,
// the pair's own σ is its centre's, not rescaled by the others' scatter: rescaled, right pairs
// pulled by unlisted lines stood out as much as wrong ones (on the development sweep's 985 paired
// instruments, 52 right ones ranked above the first wrong one, against none this way).
import { calibrationUncertainty } from "./calibration-uncertainty";
import type { CalibrationModel } from "./calibration-model";
import {
  fitCalibration,
  fittedXUncertainties,
  type FitCalibrationOptions,
} from "./fit-calibration";
import type { LampPair } from "./lamp-pairing-types";
import { modelEvaluation } from "./model-evaluation";
import { prismRefitOptions } from "./prism-refit-options";
import { linearisedFit, type LinearisedFit } from "./linearised-fit";

/** The options that refit `model`'s own shape: the same kind and degree, a prism's glass and angles. */
function sameShape(model: CalibrationModel): FitCalibrationOptions {
  if (model.kind === "polynomial") return { model: "polynomial", degree: model.degree };
  if (model.kind === "hartmann") return { model: "hartmann" };
  return {
    ...prismRefitOptions(model),
    apexDeg: model.apexDeg,
    fitApex: model.apexFitted,
    fitAxisAngle: model.axisAngleFitted ?? false,
  };
}

/** What each pair's miss is divided by: the σ of the others' prediction and of its own centre, nm. */
function missInSigmas(
  missNm: number,
  predictionVarianceNm2: number,
  centreSigmaNm: number,
): number {
  const sigmas = Math.abs(missNm) / Math.sqrt(predictionVarianceNm2 + centreSigmaNm ** 2);
  // NaN (no wavelength there) counts as the worst.
  return Number.isNaN(sigmas) ? Infinity : sigmas;
}

/**
 * Every pair's held-out miss from `fit`, the linearisation of `model` at its fit (no refits): the
 * deleted residual rᵢ/(1 − hᵢ) with the leverage hᵢ of the weighted Jacobian, and the others'
 * prediction variance s₍ᵢ₎²·σᵢ²·hᵢ/(1 − hᵢ), s₍ᵢ₎² being their χ² per degree of freedom. Exact for a
 * polynomial; for a prism or Hartmann curve an estimate.
 */
function linearisedMisses(
  fit: LinearisedFit,
  model: CalibrationModel,
  centreFloorX: number,
): number[] {
  const { sigmaX, weightedResiduals: u, sigmaNm, slope, leverage } = fit;
  const n = u.length;
  const p = model.parameters.length;
  const chiSquare = u.reduce((sum, v) => sum + v * v, 0);
  return u.map((_, i) => {
    const h = leverage[i];
    const restScale = Math.max(chiSquare - (u[i] * u[i]) / (1 - h), 0) / (n - 1 - p);
    return missInSigmas(
      (u[i] * sigmaNm[i]) / (1 - h),
      restScale * sigmaNm[i] ** 2 * (h / (1 - h)),
      Math.max(sigmaX[i], centreFloorX) * slope[i],
    );
  });
}

/** `pair`'s held-out miss with `model`'s shape refitted exactly to the other pairs. */
function refittedMiss(
  index: number,
  pairs: readonly LampPair[],
  sigmaX: readonly number[],
  model: CalibrationModel,
  domain: [number, number],
  centreFloorX: number,
): number {
  const pair = pairs[index];
  const rest = pairs.filter((p) => p !== pair);
  try {
    const refit = fitCalibration(rest, {
      ...sameShape(model),
      domain,
      rejectOutliers: false,
    }).model;
    const at = Float64Array.of(pair.x);
    const { wavelengthNm, dispersion } = modelEvaluation(refit, at);
    return missInSigmas(
      pair.wavelengthNm - wavelengthNm[0],
      calibrationUncertainty(refit, at)[0] ** 2,
      Math.max(sigmaX[index], centreFloorX) * Math.abs(dispersion[0]),
    );
  } catch {
    // The rest do not determine the shape: nothing to hold this pair to.
    return 0;
  }
}

/**
 * The pair that falls farthest from `model`'s shape refitted without it, and by how many σ; null when
 * too few pairs leave a refit with residuals to scale by. Every pair is first judged by the
 * linearisation, which overstates a prism's misses where its parameters are strongly correlated; the
 * pairs it puts beyond `screenSigmas` are refitted exactly, and their exact miss counts.
 * `centreFloorX` is the least σ of a centre (x units): no peak is known better than a small share of
 * its width. `given` is `model` linearised at `pairs` when the caller has it already (null: it cannot be).
 */
export function worstHeldOutMiss(
  pairs: readonly LampPair[],
  model: CalibrationModel,
  domain: [number, number],
  centreFloorX: number,
  screenSigmas: number,
  given?: LinearisedFit | null,
): { pair: LampPair; sigmas: number } | null {
  if (pairs.length - 1 < model.parameters.length + 1) return null;
  const fit = given === undefined ? linearisedFit(pairs, model) : given;
  const sigmaX = fit?.sigmaX ?? fittedXUncertainties(pairs);
  const linearised = fit && linearisedMisses(fit, model, centreFloorX);
  let worst: { pair: LampPair; sigmas: number } | null = null;
  pairs.forEach((pair, i) => {
    const screened = linearised ? linearised[i] : Infinity;
    const sigmas =
      screened > screenSigmas
        ? refittedMiss(i, pairs, sigmaX, model, domain, centreFloorX)
        : screened;
    if (!worst || sigmas > worst.sigmas) worst = { pair, sigmas };
  });
  return worst;
}
