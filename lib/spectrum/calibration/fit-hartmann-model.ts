// Non-linear least-squares fit of the Hartmann dispersion formula λ = λ₀ + c/(t₀ − t)^α: the prism
// calibration without a glass. The formula is linear in (λ₀, c) for a fixed pole t₀ and exponent α, so
// those two are solved in closed form at every step and only (t₀, α) are searched (variable
// projection): a scan of t₀ with α = 1 on both sides of the array gives the start, then damped
// Gauss–Newton steps on the projected problem. A four-parameter Levenberg–Marquardt
// (ml-levenberg-marquardt, used before) crawled along the valley the correlated parameters make: it ran
// its 400 iterations on every fit and still ended above the projected fit's χ² in 96 of 170 fits taken
// from prism calibrations, twice not moving from its start at all.
import { CalibrationError } from "./calibration-error";
import { jacobianCovariance } from "./jacobian-covariance";
import type { HartmannCalibrationModel } from "./calibration-model";
import {
  domainNormalisation,
  modelBase,
  type CovarianceScaling,
  type ModelFitInput,
} from "./model-fit-input";
import { dampedStep, lineProjection, twoParameterNormal, weightedLine } from "./weighted-line";

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
    const solution = weightedLine(
      t.map((value) => 1 / (side * (t0 - value))),
      y,
      sigma,
    );
    if (!best || solution.chiSquare < best.chiSquare) {
      best = {
        parameters: [solution.intercept, solution.slope, t0, 1],
        chiSquare: solution.chiSquare,
      };
    }
  }
  return best!;
}

/** Steps of the projected search at most; it settles in about five. */
const MAX_STEPS = 200;

/**
 * Damped Gauss–Newton over (t₀, α) with (λ₀, c) solved at each point (Kaufman's form of variable
 * projection: the derivatives of c·u in t₀ and α, whitened, with the line's span projected out).
 * Stops when a step gains less than 10⁻¹² of χ², or when no damping finds a smaller χ².
 */
function refine(
  t: number[],
  y: number[],
  sigma: number[],
  side: 1 | -1,
  start: number[],
): number[] {
  const w = sigma.map((s) => 1 / s);
  const poleBound = side * (1 + POLE_MARGIN);
  const clampPole = (t0: number) =>
    side > 0 ? Math.min(Math.max(t0, poleBound), 1e9) : Math.max(Math.min(t0, poleBound), -1e9);
  const clampAlpha = (alpha: number) => Math.min(Math.max(alpha, ALPHA_LIMITS[0]), ALPHA_LIMITS[1]);
  const at = (t0: number, alpha: number) => {
    const base = t.map((value) => side * (t0 - value));
    const u = base.map((b) => b ** -alpha);
    const line = weightedLine(u, y, sigma);
    return {
      t0,
      alpha,
      base,
      u,
      lambda0: line.intercept,
      c: line.slope,
      chiSquare: line.chiSquare,
    };
  };
  let current = at(clampPole(start[2]), clampAlpha(start[3]));
  if (!Number.isFinite(current.chiSquare)) return start;
  let damping = 1e-3;
  for (let step = 0; step < MAX_STEPS; step++) {
    const { base, u, c, alpha } = current;
    const residual = u.map((value, i) => (y[i] - current.lambda0 - c * value) * w[i]);
    // ∂u/∂t₀ = −α·side·u/base, ∂u/∂α = −u·ln(base), whitened, with the line's span projected out.
    const { project } = lineProjection(w, u);
    const columns: [number[], number[]] = [
      project(u.map((value, i) => (w[i] * c * -alpha * side * value) / base[i])).rest,
      project(u.map((value, i) => w[i] * c * -value * Math.log(base[i]))).rest,
    ];
    const normal = twoParameterNormal(columns, residual);
    let next: typeof current | undefined;
    for (let attempt = 0; attempt < 30 && !next; attempt++) {
      const stepped = dampedStep(normal, damping);
      const trial = stepped
        ? at(clampPole(current.t0 + stepped[0]), clampAlpha(alpha + stepped[1]))
        : undefined;
      if (trial && Number.isFinite(trial.chiSquare) && trial.chiSquare <= current.chiSquare)
        next = trial;
      else damping *= 11;
    }
    if (!next) break;
    const gain = current.chiSquare - next.chiSquare;
    current = next;
    damping = Math.max(damping / 9, 1e-12);
    if (gain <= 1e-12 * current.chiSquare) break;
  }
  return [current.lambda0, current.c, current.t0, current.alpha];
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
