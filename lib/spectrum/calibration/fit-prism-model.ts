// Fit of the physical prism model (Sellmeier glass, apex angle, incidence, camera scale, position and
// axis angle) to the pairs. The fit works in x — the measured quantity — so it needs only the forward
// model x(λ); the inverse is used afterwards for residuals in nm.
import { levenbergMarquardt } from "ml-levenberg-marquardt";
import { CalibrationError } from "./calibration-error";
import { jacobianCovariance } from "./jacobian-covariance";
import type { PrismCalibrationModel } from "./calibration-model";
import type { GlassName } from "./glass-catalogue";
import { modelEvaluation } from "./model-evaluation";
import { fitForwardPrism, MAX_AXIS_ANGLE_RAD } from "./fit-forward-prism";
import { modelBase, type CovarianceScaling, type ModelFitInput } from "./model-fit-input";
import { cameraTangent, prismDeviationRad } from "./prism-forward";
import { refractiveIndex } from "./refractive-index";
import { refractiveIndexOrNaN } from "./refractive-index-or-nan";
import { fitGlassTerms, type GlassTermsStart } from "./fit-glass-terms";
import {
  FITTED_GLASS_PARAMETERS,
  fittedGlassCoefficients,
  fittedGlassTermsOf,
} from "./fitted-glass";

const DEG = Math.PI / 180;

export interface PrismFitSettings {
  glass: GlassName;
  apexDeg: number;
  fitApex: boolean;
  /** Fit the camera axis angle φ (see PrismCalibrationModel). */
  fitAxisAngle: boolean;
  /** Fit the glass's Sellmeier terms too, starting from `glass` (fitted-glass.ts). @default false */
  fitGlass?: boolean;
  /** Where a fitted glass's search starts (fittedGlassStartOf); needed with `fitGlass`. */
  start?: GlassTermsStart;
  scaling: CovarianceScaling;
}

/**
 * Fits the prism model of one glass, or with the glass's terms fitted (`fitGlass`); throws
 * CalibrationError("fit-failed") when no geometry passes light, RangeError for `fitApex` with `fitGlass`.
 */
export function fitPrismModel(
  input: ModelFitInput,
  settings: PrismFitSettings,
): PrismCalibrationModel {
  const { x, wavelengthNm, xUncertainty } = input;
  const low = Math.min(...wavelengthNm);
  const high = Math.max(...wavelengthNm);
  const referenceNm = (low + high) / 2;
  const apexRad = settings.apexDeg * DEG;
  const { fitApex, fitAxisAngle } = settings;
  const fitGlass = settings.fitGlass ?? false;
  if (fitApex && fitGlass) throw new RangeError("fitApex and fitGlass are exclusive");
  const apexIndex = 3;
  const axisAngleIndex = fitApex ? 4 : 3;

  let direction: 1 | -1;
  let initial: number[];
  if (fitGlass) {
    // The glass's terms and the angles are fitted together from the given start; the camera's scale
    // and position follow them.
    const { start } = settings;
    if (!start) throw new RangeError("fitGlass needs a start");
    const glassFit = fitGlassTerms(
      x,
      wavelengthNm,
      xUncertainty,
      { apexRad, referenceNm, fitAxisAngle },
      start,
    );
    if (!glassFit) {
      throw new CalibrationError(
        "fit-failed",
        `a glass fitted from ${settings.glass}: no prism geometry passes all the pairs' wavelengths`,
      );
    }
    const [incidence, slope, axis, ...rest] = glassFit.parameters;
    direction = slope > 0 ? 1 : -1;
    initial = [incidence, Math.abs(slope), axis, ...rest];
  } else {
    // The forward fit with the apex as given is the start, and with the apex fixed it is already the
    // solution (same model, same χ² in x); only a fitted apex needs the full Levenberg–Marquardt below.
    const start = forwardStart(input, settings, referenceNm);
    direction = start.direction;
    initial = [start.incidenceRad, start.slope, start.axisX];
    if (fitApex) initial.push(apexRad);
    if (fitAxisAngle) initial.push(start.axisAngleRad);
  }

  // n(λ) of every pair is fixed during the fit of a catalogue glass: computing the Sellmeier sums once
  // leaves only Snell's law per evaluation, and focalX and axisX enter linearly (analytic derivatives).
  // A fitted glass's indices follow its terms (only the final Jacobian asks for them).
  const catalogue = fitGlass
    ? null
    : {
        reference: refractiveIndex(settings.glass, referenceNm),
        ofPair: wavelengthNm.map((lambda) => refractiveIndex(settings.glass, lambda)),
      };
  const indicesAt = (parameters: number[], i: number) => {
    if (catalogue) return { reference: catalogue.reference, ofPair: catalogue.ofPair[i] };
    const glass = fittedGlassCoefficients(fittedGlassTermsOf(parameters));
    return {
      reference: refractiveIndexOrNaN(glass, referenceNm),
      ofPair: refractiveIndexOrNaN(glass, wavelengthNm[i]),
    };
  };
  const tangentAt = (parameters: number[], i: number) => {
    const apex = fitApex ? parameters[apexIndex] : apexRad;
    const indices = indicesAt(parameters, i);
    const angle =
      prismDeviationRad(indices.reference, parameters[0], apex) -
      prismDeviationRad(indices.ofPair, parameters[0], apex);
    return cameraTangent(angle, fitAxisAngle ? parameters[axisAngleIndex] : 0);
  };
  const forward = (parameters: number[], i: number) =>
    parameters[2] + direction * parameters[1] * tangentAt(parameters, i);
  const gradient = (parameters: number[], i: number) => {
    const row = [0, direction * tangentAt(parameters, i), 1];
    const angular = (k: number) => {
      const h = 1e-7 * Math.max(Math.abs(parameters[k]), 1e-2);
      const up = parameters.slice();
      const down = parameters.slice();
      up[k] += h;
      down[k] -= h;
      return (forward(up, i) - forward(down, i)) / (2 * h);
    };
    row[0] = angular(0);
    for (let k = 3; k < parameters.length; k++) row.push(angular(k));
    return row;
  };
  const chiSquareAt = (parameters: number[]) =>
    x.reduce((sum, value, i) => sum + ((value - forward(parameters, i)) / xUncertainty[i]) ** 2, 0);
  let parameters = initial;
  if (fitApex) {
    const minValues = [1e-3, 1e-9, -1e12, 5 * DEG];
    const maxValues = [Math.PI / 2 - 1e-3, 1e15, 1e12, 85 * DEG];
    if (fitAxisAngle) {
      minValues.push(-MAX_AXIS_ANGLE_RAD);
      maxValues.push(MAX_AXIS_ANGLE_RAD);
    }
    // ml-levenberg-marquardt stops only on an absolute error or the iteration cap, so it runs in short
    // rounds until χ² stops falling; from the forward fit's start a few rounds suffice.
    let previous = chiSquareAt(parameters);
    for (let round = 0; round < 15; round++) {
      const fit = levenbergMarquardt(
        { x: x.map((_, i) => i), y: x.map((value, i) => value / xUncertainty[i]) },
        (trial) => (i) => {
          const value = forward(trial, i);
          // A geometry that loses a ray gets a large residual instead of NaN, so LM steps back.
          return (Number.isFinite(value) ? value : 1e12) / xUncertainty[i];
        },
        {
          initialValues: parameters,
          jacobianFunction: (trial) => (i) =>
            gradient(trial, i).map((g) => (Number.isFinite(g) ? g : 0) / xUncertainty[i]),
          minValues,
          maxValues,
          damping: 1e-3,
          maxIterations: 20,
          errorTolerance: 1e-14,
        },
      );
      const current = chiSquareAt(fit.parameterValues);
      if (!(current <= previous)) break;
      parameters = fit.parameterValues;
      const converged = previous - current <= 1e-10 * previous + 1e-14;
      previous = current;
      if (converged) break;
    }
  }
  const rows = x.map((_, i) => gradient(parameters, i).map((g) => g / xUncertainty[i]));
  if (!parameters.every(Number.isFinite) || !rows.every((row) => row.every(Number.isFinite))) {
    throw new CalibrationError("fit-failed", `${settings.glass}: the prism fit did not converge`);
  }
  const chiSquare = chiSquareAt(parameters);
  const unscaledCovariance = jacobianCovariance(rows);
  const parameterNames = ["incidenceRad", "focalX", "axisX"];
  if (fitApex) parameterNames.push("apexRad");
  if (fitAxisAngle) parameterNames.push("axisAngleRad");
  if (fitGlass) parameterNames.push(...FITTED_GLASS_PARAMETERS);
  const model: PrismCalibrationModel = {
    kind: "prism",
    glass: settings.glass,
    apexDeg: fitApex ? parameters[apexIndex] / DEG : settings.apexDeg,
    apexFitted: fitApex,
    ...(fitAxisAngle ? { axisAngleFitted: true } : {}),
    ...(fitGlass ? { glassFitted: true } : {}),
    direction,
    referenceWavelengthNm: referenceNm,
    ...modelBase(
      input,
      parameters,
      parameterNames,
      unscaledCovariance,
      chiSquare,
      wavelengthNm,
      settings.scaling,
    ),
  };
  const fitted = modelEvaluation(model, x).wavelengthNm;
  const rebuilt = modelBase(
    input,
    parameters,
    parameterNames,
    unscaledCovariance,
    chiSquare,
    Array.from(fitted),
    settings.scaling,
  );
  return { ...model, rmsNm: rebuilt.rmsNm };
}

/** The catalogue glass's forward fit as the start of its prism fit: [incidence, |slope|, axis, φ], direction. */
function forwardStart(input: ModelFitInput, settings: PrismFitSettings, referenceNm: number) {
  const fit = fitForwardPrism(
    input.x.map((value, i) => ({
      x: value,
      wavelengthNm: input.wavelengthNm[i],
      xUncertainty: input.xUncertainty[i],
    })),
    settings.glass,
    {
      apexDeg: settings.apexDeg,
      referenceWavelengthNm: referenceNm,
      fitAxisAngle: settings.fitAxisAngle,
    },
  );
  const [incidenceRad, slope, axisX, axisAngleRad = 0] = fit.parameters;
  if (slope === 0) {
    throw new CalibrationError(
      "fit-failed",
      `${settings.glass}: no prism geometry passes all the pairs' wavelengths`,
    );
  }
  return {
    incidenceRad,
    slope: Math.abs(slope),
    axisX,
    axisAngleRad,
    direction: (slope > 0 ? 1 : -1) as 1 | -1,
  };
}
