// Fast fit of the Hartmann form run forwards, x = a + b·((λ − λ₀)/100 nm)^(−α), used while pairing a
// prism: four parameters and no glass, fitted in x (the measured quantity) with a prediction interval,
// so pairing can ask both where a line should fall and how sure that place is.
import { CalibrationError } from "./calibration-error";
import { jacobianCovariance } from "./jacobian-covariance";
import { weightedLine } from "./weighted-line";
import { solveSymmetric } from "../statistics/solve-symmetric";

/** One pair as the forward fit needs it. */
export interface ForwardHartmannPoint {
  x: number;
  wavelengthNm: number;
  /** 1σ of x; 1 when not given. */
  xUncertainty?: number;
}

export interface FitForwardHartmannOptions {
  /**
   * Parameters [a, b, λ₀, α] to start from (a previous fit of nearly the same pairs); a scan of λ₀
   * with α = 1 is always tried as well and the better end point kept.
   * @default undefined
   */
  start?: readonly number[];
  /**
   * The pole λ₀ is kept at least 1 nm below this wavelength, so every line the fit will be asked about
   * (not only the paired ones) has a prediction.
   * @default the bluest pair's wavelength
   */
  poleBelowNm?: number;
}

/** A forward Hartmann fit: parameters, χ², and x with its prediction interval at any λ. */
export interface ForwardHartmannFit {
  /** [a (x units), b (x units), λ₀ (nm), α]. */
  parameters: number[];
  chiSquare: number;
  dof: number;
  /** RMS of the x residuals, x units (unweighted). */
  rmsX: number;
  predictX: (wavelengthNm: number) => number;
  /**
   * 1σ of a new observation at λ: sqrt(s²·(g·C·gᵀ) + σpeak²·max(1, s²)) with s² = max(1, χ²/dof), the
   * textbook prediction interval, so the model's misfit widens it where the x uncertainties alone would not.
   */
  predictionSigmaX: (wavelengthNm: number, peakSigmaX?: number) => number;
}

const SCALE_NM = 100;
const ALPHA_LIMITS: [number, number] = [0.1, 10];
/** Closest the pole may come below the bluest pair, nm. */
const POLE_MARGIN_NM = 1;

function row(parameters: readonly number[], lambda: number): number[] {
  const [, b, lambda0, alpha] = parameters;
  const base = (lambda - lambda0) / SCALE_NM;
  const u = base ** -alpha;
  return [1, u, (b * alpha * u) / base / SCALE_NM, -b * u * Math.log(base)];
}

function valueAt(parameters: readonly number[], lambda: number): number {
  const [a, b, lambda0, alpha] = parameters;
  return a + b * ((lambda - lambda0) / SCALE_NM) ** -alpha;
}

/** JᵀWJ and JᵀWr of the weighted residuals at `parameters` (undamped). */
function normalEquations(
  parameters: readonly number[],
  x: readonly number[],
  lambda: readonly number[],
  sigma: readonly number[],
): { normal: number[][]; gradient: number[] } {
  const normal = [0, 1, 2, 3].map(() => [0, 0, 0, 0]);
  const gradient = [0, 0, 0, 0];
  const a = parameters[0];
  const b = parameters[1];
  for (let i = 0; i < x.length; i++) {
    const g = row(parameters, lambda[i]);
    // g[1] is the power itself, so the value needs no second power (valueAt gives the same bits).
    const r = (x[i] - (a + b * g[1])) / sigma[i];
    for (let j = 0; j < 4; j++) {
      gradient[j] += (g[j] / sigma[i]) * r;
      for (let k = 0; k < 4; k++) normal[j][k] += (g[j] * g[k]) / sigma[i] ** 2;
    }
  }
  return { normal, gradient };
}

/** Fits x = a + b·((λ − λ₀)/100)^(−α) by Levenberg–Marquardt; throws CalibrationError when it cannot. */
export function fitForwardHartmann(
  points: readonly ForwardHartmannPoint[],
  options: FitForwardHartmannOptions = {},
): ForwardHartmannFit {
  if (!Array.isArray(points) || points.length < 5) {
    throw new RangeError(
      `points must hold at least 5 pairs (4 parameters + 1), got ${points?.length}`,
    );
  }
  const x = points.map((p) => p.x);
  const lambda = points.map((p) => p.wavelengthNm);
  const sigma = points.map((p) => p.xUncertainty ?? 1);
  const bluest = Math.min(...lambda);
  const poleLimit = Math.min(bluest, options.poleBelowNm ?? bluest) - POLE_MARGIN_NM;
  const chiSquareOf = (parameters: readonly number[]) => {
    let sum = 0;
    for (let i = 0; i < x.length; i++)
      sum += ((x[i] - valueAt(parameters, lambda[i])) / sigma[i]) ** 2;
    return sum;
  };
  const valid = (p: readonly number[]) =>
    p.every(Number.isFinite) &&
    p[2] < poleLimit &&
    p[3] >= ALPHA_LIMITS[0] &&
    p[3] <= ALPHA_LIMITS[1];

  // With λ₀ and α fixed the model is a straight line in u, so a scan of λ₀ at α = 1 gives a start.
  const lineFit = (lambda0: number, alpha: number): number[] => {
    const u = lambda.map((value) => ((value - lambda0) / SCALE_NM) ** -alpha);
    const line = weightedLine(u, x, sigma);
    return [line.intercept, line.slope, lambda0, alpha];
  };
  const starts: number[][] = [];
  let scanned: { parameters: number[]; chiSquare: number } | undefined;
  for (let k = 0; k < 60; k++) {
    const parameters = lineFit((poleLimit * k) / 60, 1);
    const chiSquare = chiSquareOf(parameters);
    if (valid(parameters) && (!scanned || chiSquare < scanned.chiSquare))
      scanned = { parameters, chiSquare };
  }
  if (scanned) starts.push(scanned.parameters);
  if (options.start && valid(options.start)) starts.push(options.start.slice());

  let best: { parameters: number[]; chiSquare: number } | undefined;
  for (const start of starts) {
    let parameters = start;
    let chiSquare = chiSquareOf(parameters);
    let damping = 1e-3;
    // The normal equations at the current parameters, built once for every damping tried there.
    let equations = normalEquations(parameters, x, lambda, sigma);
    for (let iteration = 0; iteration < 100 && damping < 1e12; iteration++) {
      const normal = equations.normal.map((row, j) =>
        row.map((value, k) => (j === k ? value * (1 + damping) + 1e-300 : value)),
      );
      const step = solveSymmetric(normal, equations.gradient);
      if (!step) {
        damping *= 10;
        continue;
      }
      const trial = parameters.map((p, j) => p + step[j]);
      const trialChiSquare = valid(trial) ? chiSquareOf(trial) : Infinity;
      if (trialChiSquare < chiSquare) {
        const converged = chiSquare - trialChiSquare <= 1e-10 * chiSquare + 1e-14;
        parameters = trial;
        chiSquare = trialChiSquare;
        damping = Math.max(damping / 3, 1e-9);
        if (converged) break;
        equations = normalEquations(parameters, x, lambda, sigma);
      } else {
        damping *= 4;
      }
    }
    if (!best || chiSquare < best.chiSquare) best = { parameters, chiSquare };
  }
  if (!best || !Number.isFinite(best.chiSquare)) {
    throw new CalibrationError("fit-failed", "the forward Hartmann fit found no finite solution");
  }
  const { parameters, chiSquare } = best;
  const covariance = jacobianCovariance(
    lambda.map((l, i) => row(parameters, l).map((g) => g / sigma[i])),
  );
  const dof = x.length - 4;
  const varianceFactor = dof > 0 ? Math.max(1, chiSquare / dof) : 1;
  let sumSquares = 0;
  for (let i = 0; i < x.length; i++) sumSquares += (x[i] - valueAt(parameters, lambda[i])) ** 2;
  return {
    parameters,
    chiSquare,
    dof,
    rmsX: Math.sqrt(sumSquares / x.length),
    predictX: (wavelengthNm) =>
      wavelengthNm > parameters[2] ? valueAt(parameters, wavelengthNm) : Number.NaN,
    predictionSigmaX: (wavelengthNm, peakSigmaX = 1) => {
      if (!(wavelengthNm > parameters[2])) return Number.NaN;
      const g = row(parameters, wavelengthNm);
      let variance = 0;
      for (let j = 0; j < 4; j++)
        for (let k = 0; k < 4; k++) variance += g[j] * covariance[j][k] * g[k];
      return Math.sqrt(varianceFactor * (variance + peakSigmaX ** 2));
    },
  };
}
