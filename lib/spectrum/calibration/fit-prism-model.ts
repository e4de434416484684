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
import { prismDeviationRad } from "./prism-forward";
import { refractiveIndex } from "./refractive-index";

const DEG = Math.PI / 180;

export interface PrismFitSettings {
  glass: GlassName;
  apexDeg: number;
  fitApex: boolean;
  scaling: CovarianceScaling;
}

/** tan(δref − δ(λ)) for each λ at a given incidence, or undefined when some ray cannot exit. */
function angularPositions(nReference: number, nOfPair: number[], incidenceRad: number, apexRad: number) {
  const reference = prismDeviationRad(nReference, incidenceRad, apexRad);
  const values = nOfPair.map((n) => Math.tan(reference - prismDeviationRad(n, incidenceRad, apexRad)));
  return values.every(Number.isFinite) && Number.isFinite(reference) ? values : undefined;
}

/** Weighted straight line y = a + b·u in closed form (the scan runs it ~120 times per glass). */
function weightedLine(u: number[], y: number[], sigma: number[]) {
  let sw = 0;
  let su = 0;
  let sy = 0;
  for (let i = 0; i < u.length; i++) {
    const w = 1 / sigma[i] ** 2;
    sw += w;
    su += w * u[i];
    sy += w * y[i];
  }
  const meanU = su / sw;
  const meanY = sy / sw;
  let suu = 0;
  let suy = 0;
  for (let i = 0; i < u.length; i++) {
    const w = 1 / sigma[i] ** 2;
    suu += w * (u[i] - meanU) ** 2;
    suy += w * (u[i] - meanU) * (y[i] - meanY);
  }
  const slope = suu > 0 ? suy / suu : 0;
  const axis = meanY - slope * meanU;
  let chiSquare = 0;
  for (let i = 0; i < u.length; i++) chiSquare += ((y[i] - axis - slope * u[i]) / sigma[i]) ** 2;
  return { axis, slope, chiSquare };
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
  // n(λ) of every pair is fixed during the fit: computing the Sellmeier sums once leaves only Snell's
  // law per evaluation, and focalX and axisX enter linearly (analytic derivatives).
  const nOfPair = wavelengthNm.map((lambda) => refractiveIndex(settings.glass, lambda));
  const minimumDeviationIncidence = Math.asin(Math.min(nReference * Math.sin(apexRad / 2), 1));
  let start: { incidence: number; axis: number; slope: number; chiSquare: number } | undefined;
  for (let offsetDeg = -25; offsetDeg <= 35; offsetDeg += 0.5) {
    const incidence = minimumDeviationIncidence + offsetDeg * DEG;
    if (incidence <= 0 || incidence >= Math.PI / 2) continue;
    const positions = angularPositions(nReference, nOfPair, incidence, apexRad);
    if (!positions) continue;
    const line = weightedLine(positions, x, xUncertainty);
    if (!start || line.chiSquare < start.chiSquare) start = { incidence, ...line };
  }
  if (!start || start.slope === 0) {
    throw new CalibrationError("fit-failed", `${settings.glass}: no prism geometry passes all the pairs' wavelengths`);
  }
  const direction: 1 | -1 = start.slope > 0 ? 1 : -1;
  const initial = [start.incidence, Math.abs(start.slope), start.axis];
  if (settings.fitApex) initial.push(apexRad);

  const angleAt = (parameters: number[], i: number) => {
    const apex = settings.fitApex ? parameters[3] : apexRad;
    return (
      prismDeviationRad(nReference, parameters[0], apex) - prismDeviationRad(nOfPair[i], parameters[0], apex)
    );
  };
  const forward = (parameters: number[], i: number) => parameters[2] + direction * parameters[1] * Math.tan(angleAt(parameters, i));
  const gradient = (parameters: number[], i: number) => {
    const tangent = Math.tan(angleAt(parameters, i));
    const row = [0, direction * tangent, 1];
    const angular = (k: number) => {
      const h = 1e-7 * Math.max(Math.abs(parameters[k]), 1e-2);
      const up = parameters.slice();
      const down = parameters.slice();
      up[k] += h;
      down[k] -= h;
      return (forward(up, i) - forward(down, i)) / (2 * h);
    };
    row[0] = angular(0);
    if (settings.fitApex) row.push(angular(3));
    return row;
  };
  const index = x.map((_, i) => i);
  const chiSquareAt = (parameters: number[]) =>
    x.reduce((sum, value, i) => sum + ((value - forward(parameters, i)) / xUncertainty[i]) ** 2, 0);
  // ml-levenberg-marquardt stops only on an absolute error or the iteration cap, so it runs in short
  // rounds until χ² stops falling; from the scanned start a few rounds suffice.
  let parameters = initial;
  let previous = chiSquareAt(parameters);
  for (let round = 0; round < 15; round++) {
    const fit = levenbergMarquardt(
      { x: index, y: x.map((value, i) => value / xUncertainty[i]) },
      (trial) => (i) => {
        const value = forward(trial, i);
        // A geometry that loses a ray gets a large residual instead of NaN, so LM steps back.
        return (Number.isFinite(value) ? value : 1e12) / xUncertainty[i];
      },
      {
        initialValues: parameters,
        jacobianFunction: (trial) => (i) => gradient(trial, i).map((g) => (Number.isFinite(g) ? g : 0) / xUncertainty[i]),
        minValues: settings.fitApex ? [1e-3, 1e-9, -1e12, 5 * DEG] : [1e-3, 1e-9, -1e12],
        maxValues: settings.fitApex ? [Math.PI / 2 - 1e-3, 1e15, 1e12, 85 * DEG] : [Math.PI / 2 - 1e-3, 1e15, 1e12],
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
