// The prism model with the glass's Sellmeier terms fitted (fitted-glass.ts): x = a + b·(tan(δref − δ(λ)
// + φ) − tan φ) with n(λ) from [B₁, C₁, B₃]. The camera's scale b and position a enter linearly and
// are projected out (variable projection, Golub & Pereyra 1973, cited from memory), which leaves the
// incidence, the axis angle and the three glass terms to a Levenberg–Marquardt search with Marquardt's
// diagonal scaling; its Jacobian is a forward difference of the projected residuals. A search over
// all seven parameters crawls along the valley that the index level, the incidence and the scale make
// together, and a general-purpose solver did not leave its start on the sweep's prisms.
import { MAX_AXIS_ANGLE_RAD } from "./fit-forward-prism";
import { fittedGlassCoefficients, maxUltravioletResonanceUm2 } from "./fitted-glass";
import { cameraTangent, prismDeviationRad } from "./prism-forward";
import { refractiveIndexOrNaN } from "./refractive-index-or-nan";
import { dot } from "../statistics/dot";
import { solveSymmetric } from "../statistics/solve-symmetric";
import { lineProjection } from "./weighted-line";

export interface GlassTermsStart {
  incidenceRad: number;
  axisAngleRad: number;
  /** [B₁, C₁ (µm²), B₃]. */
  terms: readonly number[];
}

export interface GlassTermsFit {
  /** [incidence, b, a, (φ,) B₁, C₁, B₃], b signed by the axis direction. */
  parameters: number[];
}

/**
 * Steps the search may take: along the valley it crawls (the incidence, B₁ and the scale trade off),
 * and on SciPy's reference case (tests/reference) it needed about 500 to reach least_squares's minimum.
 */
const MAX_ITERATIONS = 1000;

/** The camera line's coefficients (x ≈ alpha + beta·u), the residuals with its span removed, and χ². */
interface Projected {
  alpha: number;
  beta: number;
  rest: number[];
  chiSquare: number;
}

/**
 * Bounds of the glass terms: the ultraviolet resonance below the bluest pair, its strength positive;
 * B₃ of either sign (one ultraviolet term standing in for a glass's two leaves a curvature that a
 * negative B₃ takes up), each below tenfold any known glass's.
 */
function termsInside([b1, c1, b3]: readonly number[], bluestNm: number): boolean {
  return (
    b1 > 1e-3 &&
    b1 < 10 &&
    c1 > 1e-5 &&
    c1 < maxUltravioletResonanceUm2(bluestNm) &&
    Math.abs(b3) < 30
  );
}

/**
 * Fits the geometry and glass terms from `start` to the pairs (x, λ, σx) with the apex fixed; null
 * when no step from the start passes every ray.
 */
export function fitGlassTerms(
  x: readonly number[],
  wavelengthNm: readonly number[],
  sigmaX: readonly number[],
  settings: { apexRad: number; referenceNm: number; fitAxisAngle: boolean },
  start: GlassTermsStart,
): GlassTermsFit | null {
  const { apexRad, referenceNm, fitAxisAngle } = settings;
  const bluestNm = Math.min(...wavelengthNm);
  const w = sigmaX.map((s) => 1 / s);
  const whitenedX = x.map((value, i) => value * w[i]);
  // q = [incidence, (φ,) B₁, C₁, B₃]
  const unpack = (q: readonly number[]) => ({
    incidence: q[0],
    axisAngle: fitAxisAngle ? q[1] : 0,
    terms: q.slice(fitAxisAngle ? 2 : 1),
  });
  const inside = (q: readonly number[]) => {
    const { incidence, axisAngle, terms } = unpack(q);
    return (
      incidence > 1e-3 &&
      incidence < Math.PI / 2 - 1e-3 &&
      Math.abs(axisAngle) < MAX_AXIS_ANGLE_RAD &&
      termsInside(terms, bluestNm)
    );
  };
  /** The projected residuals at q, the line's coefficients and χ²; null where a ray is lost. */
  const projected = (q: readonly number[]): Projected | null => {
    const { incidence, axisAngle, terms } = unpack(q);
    const glass = fittedGlassCoefficients(terms);
    const sinIncidence = Math.sin(incidence);
    const reference = prismDeviationRad(
      refractiveIndexOrNaN(glass, referenceNm),
      incidence,
      apexRad,
      sinIncidence,
    );
    const u = wavelengthNm.map((lambda) =>
      cameraTangent(
        reference -
          prismDeviationRad(refractiveIndexOrNaN(glass, lambda), incidence, apexRad, sinIncidence),
        axisAngle,
      ),
    );
    if (!u.every(Number.isFinite)) return null;
    const { determinant, project } = lineProjection(w, u);
    if (!(determinant > 0)) return null;
    const line = project(whitenedX);
    const chiSquare = line.rest.reduce((sum, r) => sum + r * r, 0);
    return Number.isFinite(chiSquare) ? { ...line, chiSquare } : null;
  };
  let q = [start.incidenceRad, ...(fitAxisAngle ? [start.axisAngleRad] : []), ...start.terms];
  const first = inside(q) ? projected(q) : null;
  if (!first) return null;
  let current: Projected = first;
  let damping = 1e-3;
  let converged = false;
  for (let iteration = 0; iteration < MAX_ITERATIONS && !converged && damping < 1e12; iteration++) {
    const point = current;
    // Jacobian of the projected residuals, by forward differences (a lost ray: no slope there).
    const columns = q.map((value, k) => {
      const h = 1e-7 * Math.max(Math.abs(value), 1e-3);
      const above = projected(q.map((v, j) => (j === k ? v + h : v)));
      return above ? above.rest.map((r, i) => (r - point.rest[i]) / h) : point.rest.map(() => 0);
    });
    const normal = columns.map((a) => columns.map((b) => dot(a, b)));
    const gradient = columns.map((a) => dot(a, point.rest));
    // Marquardt's scaling: each parameter damped by its own curvature (floored where a term has none).
    const floor = 1e-12 * Math.max(...normal.map((row, j) => row[j]));
    let accepted = false;
    while (!accepted && damping < 1e12) {
      const damped = normal.map((row, j) =>
        row.map((value, k) => (j === k ? value + damping * Math.max(value, floor) : value)),
      );
      // A singular damped system (null): more damping.
      const step = solveSymmetric(damped, gradient);
      const trialQ = step ? q.map((value, k) => value - step[k]) : null;
      const trial = trialQ && inside(trialQ) ? projected(trialQ) : null;
      if (trialQ && trial && trial.chiSquare < point.chiSquare) {
        converged = point.chiSquare - trial.chiSquare <= 1e-12 * point.chiSquare + 1e-14;
        q = trialQ;
        current = trial;
        damping = Math.max(damping / 10, 1e-12);
        accepted = true;
      } else {
        damping *= 10;
      }
    }
  }
  const { incidence, axisAngle, terms } = unpack(q);
  return {
    parameters: [
      incidence,
      current.beta,
      current.alpha,
      ...(fitAxisAngle ? [axisAngle] : []),
      ...terms,
    ],
  };
}
