// The linear part shared by the separable fits of the calibration (Hartmann's formula at one pole and
// exponent, a forward prism at one incidence, forward Hartmann at one pole): the weighted straight line
// y ≈ a + b·u, the projection that removes that line's span from a whitened vector, and the damped
// Gauss–Newton step over the two non-linear parameters left (variable projection, Kaufman's form).

export interface WeightedLine {
  intercept: number;
  slope: number;
  /** Σ((y − a − b·u)/σ)²; Infinity when u does not vary or the sum is not finite. */
  chiSquare: number;
}

/**
 * Σw, Σw·u, Σw·u² with `weightAt(i)` as w, and with `y`, Σw·y and Σw·u·y: the normal equations of a
 * weighted straight line in u.
 */
function lineSums(
  u: ArrayLike<number>,
  weightAt: (i: number) => number,
  y?: ArrayLike<number>,
): { s0: number; s1: number; s2: number; sy: number; suy: number } {
  let s0 = 0,
    s1 = 0,
    s2 = 0,
    sy = 0,
    suy = 0;
  for (let i = 0; i < u.length; i++) {
    const w = weightAt(i);
    s0 += w;
    s1 += w * u[i];
    s2 += w * u[i] * u[i];
    if (y) {
      sy += w * y[i];
      suy += w * u[i] * y[i];
    }
  }
  return { s0, s1, s2, sy, suy };
}

/** The weighted least-squares line y ≈ intercept + slope·u (weights 1/σ²); NaN parameters when u does not vary. */
export function weightedLine(
  u: ArrayLike<number>,
  y: ArrayLike<number>,
  sigma: ArrayLike<number>,
): WeightedLine {
  const { s0, s1, s2, sy, suy } = lineSums(u, (i) => 1 / sigma[i] ** 2, y);
  const determinant = s0 * s2 - s1 * s1;
  if (!(determinant > 0)) return { intercept: Number.NaN, slope: Number.NaN, chiSquare: Infinity };
  const slope = (s0 * suy - s1 * sy) / determinant;
  const intercept = (sy - slope * s1) / s0;
  let chiSquare = 0;
  for (let i = 0; i < u.length; i++)
    chiSquare += ((y[i] - intercept - slope * u[i]) / sigma[i]) ** 2;
  return { intercept, slope, chiSquare: Number.isFinite(chiSquare) ? chiSquare : Infinity };
}

/**
 * For whitening weights w (1/σ) and the line's u: `project(v)` gives the coefficients (alpha, beta) of v
 * on the whitened columns w and w·u, and `rest`, v with that span removed. `determinant` ≤ 0 when u does
 * not vary (the coefficients are then not finite).
 */
export function lineProjection(
  w: readonly number[],
  u: readonly number[],
): {
  determinant: number;
  project: (v: readonly number[]) => { alpha: number; beta: number; rest: number[] };
} {
  const { s0: s11, s1: s12, s2: s22 } = lineSums(u, (i) => w[i] * w[i]);
  const determinant = s11 * s22 - s12 * s12;
  const project = (v: readonly number[]) => {
    let t1 = 0,
      t2 = 0;
    for (let i = 0; i < w.length; i++) {
      t1 += w[i] * v[i];
      t2 += w[i] * u[i] * v[i];
    }
    const alpha = (s22 * t1 - s12 * t2) / determinant;
    const beta = (s11 * t2 - s12 * t1) / determinant;
    return { alpha, beta, rest: v.map((value, i) => value - alpha * w[i] - beta * w[i] * u[i]) };
  };
  return { determinant, project };
}

/** The Gauss–Newton normal equations over two parameters: JᵀJ (a00, a01, a11) and Jᵀr (g0, g1). */
export interface TwoParameterNormal {
  a00: number;
  a01: number;
  a11: number;
  g0: number;
  g1: number;
}

/** The normal equations from two projected Jacobian columns and the whitened residuals. */
export function twoParameterNormal(
  [j0, j1]: readonly [readonly number[], readonly number[]],
  residual: readonly number[],
): TwoParameterNormal {
  let a00 = 0,
    a01 = 0,
    a11 = 0,
    g0 = 0,
    g1 = 0;
  for (let i = 0; i < residual.length; i++) {
    a00 += j0[i] * j0[i];
    a01 += j0[i] * j1[i];
    a11 += j1[i] * j1[i];
    g0 += j0[i] * residual[i];
    g1 += j1[i] * residual[i];
  }
  return { a00, a01, a11, g0, g1 };
}

/**
 * The Levenberg-damped Gauss–Newton step over two parameters from their normal equations (worked out
 * once per point, whatever the damping tried there); null when the damped matrix is singular.
 */
export function dampedStep(
  { a00, a01, a11, g0, g1 }: TwoParameterNormal,
  damping: number,
): [number, number] | null {
  const d00 = a00 * (1 + damping);
  const d11 = a11 * (1 + damping);
  const determinant = d00 * d11 - a01 * a01;
  if (!(determinant > 0)) return null;
  return [(d11 * g0 - a01 * g1) / determinant, (d00 * g1 - a01 * g0) / determinant];
}
