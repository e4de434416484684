// Fit of the physical prism model (Sellmeier glass, apex angle, incidence, camera scale and axis) to
// the pairs. The fit works in x — the measured quantity — so it needs only the forward model x(λ);
// the inverse is used afterwards for residuals in nm.
import { levenbergMarquardt } from "ml-levenberg-marquardt";
import { CalibrationError } from "./calibration-error";
import { jacobianCovariance } from "./jacobian-covariance";
import type { PrismCalibrationModel } from "./calibration-model";
import type { GlassName } from "./glass-catalogue";
import { modelEvaluation } from "./model-evaluation";
import { modelBase, type CovarianceScaling, type ModelFitInput } from "./model-fit-input";
import { prismDeviationRad, prismForwardX, type PrismGeometry } from "./prism-forward";
import { refractiveIndex } from "./refractive-index";
import { weightedLeastSquares } from "./weighted-least-squares";

const DEG = Math.PI / 180;

export interface PrismFitSettings {
  glass: GlassName;
  apexDeg: number;
  fitApex: boolean;
  scaling: CovarianceScaling;
}

function geometryFrom(parameters: number[], settings: PrismFitSettings, direction: 1 | -1, referenceNm: number): PrismGeometry {
  return {
    glass: settings.glass,
    incidenceRad: parameters[0],
    focalX: parameters[1],
    axisX: parameters[2],
    apexRad: settings.fitApex ? parameters[3] : settings.apexDeg * DEG,
    direction,
    referenceWavelengthNm: referenceNm,
  };
}

/** tan(δref − δ(λ)) for each λ at a given incidence, or undefined when some ray cannot exit. */
function angularPositions(settings: PrismFitSettings, incidenceRad: number, apexRad: number, referenceNm: number, wavelengthNm: number[]) {
  const reference = prismDeviationRad(refractiveIndex(settings.glass, referenceNm), incidenceRad, apexRad);
  const values = wavelengthNm.map((lambda) =>
    Math.tan(reference - prismDeviationRad(refractiveIndex(settings.glass, lambda), incidenceRad, apexRad)),
  );
  return values.every(Number.isFinite) && Number.isFinite(reference) ? values : undefined;
}

/** Fits the prism model of one glass; throws CalibrationError("fit-failed") when no geometry passes light. */
export function fitPrismModel(input: ModelFitInput, settings: PrismFitSettings): PrismCalibrationModel {
  const { x, wavelengthNm, xUncertainty } = input;
  const low = Math.min(...wavelengthNm);
  const high = Math.max(...wavelengthNm);
  const referenceNm = (low + high) / 2;
  const apexRad = settings.apexDeg * DEG;

  // Start: scan the incidence around minimum deviation; x is then linear in (axisX, direction·f).
  const nReference = refractiveIndex(settings.glass, referenceNm);
  const minimumDeviationIncidence = Math.asin(Math.min(nReference * Math.sin(apexRad / 2), 1));
  let start: { incidence: number; axis: number; slope: number; chiSquare: number } | undefined;
  for (let offsetDeg = -25; offsetDeg <= 35; offsetDeg += 0.5) {
    const incidence = minimumDeviationIncidence + offsetDeg * DEG;
    if (incidence <= 0 || incidence >= Math.PI / 2) continue;
    const positions = angularPositions(settings, incidence, apexRad, referenceNm, wavelengthNm);
    if (!positions) continue;
    const solution = weightedLeastSquares(positions.map((p) => [1, p]), x, xUncertainty);
    if (!start || solution.chiSquare < start.chiSquare) {
      start = { incidence, axis: solution.parameters[0], slope: solution.parameters[1], chiSquare: solution.chiSquare };
    }
  }
  if (!start || start.slope === 0) {
    throw new CalibrationError("fit-failed", `${settings.glass}: no prism geometry passes all the pairs' wavelengths`);
  }
  const direction: 1 | -1 = start.slope > 0 ? 1 : -1;
  const initial = [start.incidence, Math.abs(start.slope), start.axis];
  if (settings.fitApex) initial.push(apexRad);

  const forward = (parameters: number[], i: number) =>
    prismForwardX(geometryFrom(parameters, settings, direction, referenceNm), wavelengthNm[i]);
  const gradient = (parameters: number[], i: number) =>
    parameters.map((value, k) => {
      const h = 1e-7 * Math.max(Math.abs(value), 1e-2);
      const up = parameters.slice();
      const down = parameters.slice();
      up[k] += h;
      down[k] -= h;
      return (forward(up, i) - forward(down, i)) / (2 * h);
    });
  const index = x.map((_, i) => i);
  const fit = levenbergMarquardt(
    { x: index, y: x.map((value, i) => value / xUncertainty[i]) },
    (parameters) => (i) => {
      const value = forward(parameters, i);
      // A geometry that loses a ray gets a large residual instead of NaN, so LM steps back.
      return (Number.isFinite(value) ? value : 1e12) / xUncertainty[i];
    },
    {
      initialValues: initial,
      jacobianFunction: (parameters) => (i) => gradient(parameters, i).map((g) => (Number.isFinite(g) ? g : 0) / xUncertainty[i]),
      minValues: settings.fitApex ? [1e-3, 1e-9, -1e12, 5 * DEG] : [1e-3, 1e-9, -1e12],
      maxValues: settings.fitApex ? [Math.PI / 2 - 1e-3, 1e15, 1e12, 85 * DEG] : [Math.PI / 2 - 1e-3, 1e15, 1e12],
      damping: 1e-3,
      maxIterations: 300,
      errorTolerance: 1e-14,
    },
  );
  const parameters = fit.parameterValues;
  const rows = x.map((_, i) => gradient(parameters, i).map((g) => g / xUncertainty[i]));
  if (!parameters.every(Number.isFinite) || !rows.every((row) => row.every(Number.isFinite))) {
    throw new CalibrationError("fit-failed", `${settings.glass}: the prism fit did not converge`);
  }
  let chiSquare = 0;
  for (let i = 0; i < x.length; i++) chiSquare += ((x[i] - forward(parameters, i)) / xUncertainty[i]) ** 2;
  const unscaledCovariance = jacobianCovariance(rows);
  const parameterNames = ["incidenceRad", "focalX", "axisX"];
  if (settings.fitApex) parameterNames.push("apexRad");
  const model: PrismCalibrationModel = {
    kind: "prism",
    glass: settings.glass,
    apexDeg: settings.fitApex ? parameters[3] / DEG : settings.apexDeg,
    apexFitted: settings.fitApex,
    direction,
    referenceWavelengthNm: referenceNm,
    ...modelBase(input, parameters, parameterNames, unscaledCovariance, chiSquare, wavelengthNm, settings.scaling),
  };
  const fitted = modelEvaluation(model, x).wavelengthNm;
  const rebuilt = modelBase(input, parameters, parameterNames, unscaledCovariance, chiSquare, Array.from(fitted), settings.scaling);
  return { ...model, rmsNm: rebuilt.rmsNm };
}
