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

/** The weighted least-squares line y ≈ intercept + slope·u (weights 1/σ²); NaN parameters when u does not vary. */
export function weightedLine(
  u: ArrayLike<number>,
  y: ArrayLike<number>,
  sigma: ArrayLike<number>,
): WeightedLine {
  let sw = 0,
    su = 0,
    sy = 0,
    suu = 0,
    suy = 0;
  for (let i = 0; i < u.length; i++) {
    const w = 1 / sigma[i] ** 2;
    sw += w;
    su += w * u[i];
    sy += w * y[i];
    suu += w * u[i] * u[i];
    suy += w * u[i] * y[i];
  }
  const determinant = sw * suu - su * su;
  if (!(determinant > 0)) return { intercept: Number.NaN, slope: Number.NaN, chiSquare: Infinity };
  const slope = (sw * suy - su * sy) / determinant;
  const intercept = (sy - slope * su) / sw;
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
  let s11 = 0,
    s12 = 0,
    s22 = 0;
  for (let i = 0; i < w.length; i++) {
    s11 += w[i] * w[i];
    s12 += w[i] * w[i] * u[i];
    s22 += w[i] * w[i] * u[i] * u[i];
  }
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

/**
 * The Levenberg-damped Gauss–Newton step over two parameters from their projected Jacobian columns and
 * the whitened residuals; null when the damped normal matrix is singular.
 */
export function dampedStep(
  [j0, j1]: readonly [readonly number[], readonly number[]],
  residual: readonly number[],
  damping: number,
): [number, number] | null {
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
  const d00 = a00 * (1 + damping);
  const d11 = a11 * (1 + damping);
  const determinant = d00 * d11 - a01 * a01;
  if (!(determinant > 0)) return null;
  return [(d11 * g0 - a01 * g1) / determinant, (d00 * g1 - a01 * g0) / determinant];
}
