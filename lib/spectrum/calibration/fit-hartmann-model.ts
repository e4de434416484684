// Non-linear least-squares fit of the Hartmann dispersion formula λ = λ₀ + c/(t₀ − t)^α: the prism
// calibration without a glass. Starting values come from the data: with α = 1 the formula is linear
// in (λ₀, c) for a fixed pole t₀, so a scan of t₀ on both sides of the array gives the start, and
// ml-levenberg-marquardt then frees all four parameters.
import { levenbergMarquardt } from "ml-levenberg-marquardt";
import { CalibrationError } from "./calibration-error";
import { jacobianCovariance } from "./jacobian-covariance";
import type { HartmannCalibrationModel } from "./calibration-model";
import {
  domainNormalisation,
  modelBase,
  type CovarianceScaling,
  type ModelFitInput,
} from "./model-fit-input";
import { weightedLeastSquares } from "./weighted-least-squares";

/** Closest the pole may come to the array's edge, in normalised units (keeps λ finite on the array). */
const POLE_MARGIN = 1e-3;
const ALPHA_LIMITS: [number, number] = [0.05, 20];

function hartmann(parameters: number[], side: 1 | -1, t: number): number {
  const [lambda0, c, t0, alpha] = parameters;
  return lambda0 + c * (side * (t0 - t)) ** -alpha;
}

function hartmannGradient(parameters: number[], side: 1 | -1, t: number): number[] {
  const [, c, t0, alpha] = parameters;
  const base = side * (t0 - t);
  const powered = base ** -alpha;
  return [1, powered, (-side * alpha * c * powered) / base, -c * powered * Math.log(base)];
}

/** The best α = 1 start over a scan of the pole position on one side of the array. */
function scanPole(t: number[], y: number[], sigma: number[], side: 1 | -1) {
  let best: { parameters: number[]; chiSquare: number } | undefined;
  for (let i = 0; i <= 120; i++) {
    // Distances from 1e-3 to 1e3 half-ranges beyond the edge, evenly in log.
    const distance = 10 ** (-3 + (6 * i) / 120);
    const t0 = side * (1 + distance);
    const design = t.map((value) => [1, 1 / (side * (t0 - value))]);
    const solution = weightedLeastSquares(design, y, sigma);
    if (!best || solution.chiSquare < best.chiSquare) {
      best = {
        parameters: [solution.parameters[0], solution.parameters[1], t0, 1],
        chiSquare: solution.chiSquare,
      };
    }
  }
  return best!;
}

/** Levenberg–Marquardt on residuals divided by σ (passed as index → value so weights stay exact). */
function refine(
  t: number[],
  y: number[],
  sigma: number[],
  side: 1 | -1,
  start: number[],
): number[] {
  const index = t.map((_, i) => i);
  const poleBound = side * (1 + POLE_MARGIN);
  const result = levenbergMarquardt(
    { x: index, y: y.map((value, i) => value / sigma[i]) },
    (parameters) => (i) => hartmann(parameters, side, t[i]) / sigma[i],
    {
      initialValues: start,
      jacobianFunction: (parameters) => (i) =>
        hartmannGradient(parameters, side, t[i]).map((g) => g / sigma[i]),
      minValues: [-1e12, -1e12, side > 0 ? poleBound : -1e9, ALPHA_LIMITS[0]],
      maxValues: [1e12, 1e12, side > 0 ? 1e9 : poleBound, ALPHA_LIMITS[1]],
      damping: 1e-3,
      maxIterations: 400,
      errorTolerance: 1e-14,
    },
  );
  return result.parameterValues;
}

function chiSquareOf(
  t: number[],
  y: number[],
  sigma: number[],
  side: 1 | -1,
  parameters: number[],
): number {
  return t.reduce(
    (sum, value, i) => sum + ((y[i] - hartmann(parameters, side, value)) / sigma[i]) ** 2,
    0,
  );
}

/** Fits the Hartmann formula; σλ = σx·|dλ/dx| from the α = 1 start unless `uniformWeights`. */
export function fitHartmannModel(
  input: ModelFitInput,
  scaling: CovarianceScaling,
  uniformWeights: boolean,
): HartmannCalibrationModel {
  const { centre, halfRange } = domainNormalisation(input.domain);
  const t = input.x.map((x) => (x - centre) / halfRange);
  const y = input.wavelengthNm;
  let sigma = uniformWeights ? t.map(() => 1) : input.xUncertainty.slice();

  let best: { side: 1 | -1; parameters: number[]; chiSquare: number } | undefined;
  for (const side of [1, -1] as const) {
    const start = scanPole(t, y, sigma, side);
    if (!uniformWeights) {
      // Convert σx into nm with the start's dispersion, then redo the start with those weights.
      const slopes = t.map(
        (value) => Math.abs(hartmannGradient(start.parameters, side, value)[2]) / halfRange,
      );
      const sigmaNm = input.xUncertainty.map((s, i) => s * Math.max(slopes[i], 1e-12));
      const again = scanPole(t, y, sigmaNm, side);
      const parameters = refine(t, y, sigmaNm, side, again.parameters);
      const chiSquare = chiSquareOf(t, y, sigmaNm, side, parameters);
      if (!best || chiSquare < best.chiSquare) {
        best = { side, parameters, chiSquare };
        sigma = sigmaNm;
      }
      continue;
    }
    const parameters = refine(t, y, sigma, side, start.parameters);
    const chiSquare = chiSquareOf(t, y, sigma, side, parameters);
    if (!best || chiSquare < best.chiSquare) best = { side, parameters, chiSquare };
  }
  const { side, parameters, chiSquare } = best!;
  if (!parameters.every(Number.isFinite)) {
    throw new CalibrationError(
      "fit-failed",
      "the Hartmann fit did not converge to finite parameters",
    );
  }
  // Covariance from the final Jacobian: (JᵀWJ)⁻¹.
  const unscaledCovariance = jacobianCovariance(
    t.map((value, i) => hartmannGradient(parameters, side, value).map((g) => g / sigma[i])),
  );
  const fitted = t.map((value) => hartmann(parameters, side, value));
  return {
    kind: "hartmann",
    poleSide: side,
    ...modelBase(
      input,
      parameters,
      ["lambda0Nm", "cNm", "t0", "alpha"],
      unscaledCovariance,
      chiSquare,
      fitted,
      scaling,
    ),
  };
}
