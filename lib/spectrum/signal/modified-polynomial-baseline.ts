// Iterative modified polynomial baseline (Lieber & Mahadevan-Jansen 2003): a low-order polynomial
// pushed under the peaks by clipping the data to the fit at each pass; suits smooth, dark backgrounds.
import { solve, Matrix } from "ml-matrix";
import { assertFiniteArray } from "./assert-finite-array";
import { assertIntegerInRange } from "./assert-integer-in-range";

export interface ModifiedPolynomialBaselineOptions {
  /**
   * Degree of the polynomial in x.
   * @default 3
   */
  degree?: number;
  /**
   * Upper bound on clip-and-refit passes.
   * @default 100
   */
  maxIterations?: number;
  /**
   * Stop when the fit changes by less than this fraction (RMS of change / RMS of fit) between passes.
   * @default 0.001
   */
  tolerance?: number;
}

/**
 * Fits a polynomial, replaces every sample above the fit by the fit, and refits until the fit
 * settles. The polynomial is expressed in Legendre polynomials of x mapped to [−1, 1], whose
 * normal equations stay well conditioned where raw powers of a wavelength axis would not.
 * Normal equations are accumulated in one pass per iteration (no n × m design matrix).
 */
export function modifiedPolynomialBaseline(
  x: Float64Array,
  y: Float64Array,
  options: ModifiedPolynomialBaselineOptions = {},
): Float64Array {
  const { degree = 3, maxIterations = 100, tolerance = 0.001 } = options;
  assertFiniteArray(x, "x", 2);
  assertFiniteArray(y, "y", 2);
  if (x.length !== y.length)
    throw new RangeError(`x and y differ in length (${x.length} vs ${y.length})`);
  assertIntegerInRange(degree, "degree", 0, Math.min(15, x.length - 1));
  assertIntegerInRange(maxIterations, "maxIterations", 1);
  if (!(tolerance > 0)) throw new RangeError(`tolerance must be positive (got ${tolerance})`);

  const n = x.length;
  const m = degree + 1;
  const x0 = x[0];
  const span = x[n - 1] - x[0] || 1;
  // The basis at every sample and the normal matrix depend on x alone: built once, not on every pass.
  const basis = new Float64Array(n * m);
  for (let i = 0; i < n; i++) {
    const u = (2 * (x[i] - x0)) / span - 1;
    const row = i * m;
    basis[row] = 1;
    if (m > 1) basis[row + 1] = u;
    for (let k = 1; k < m - 1; k++)
      basis[row + k + 1] = ((2 * k + 1) * u * basis[row + k] - k * basis[row + k - 1]) / (k + 1);
  }
  const normal = new Float64Array(m * m);
  for (let i = 0; i < n; i++) {
    const row = i * m;
    for (let a = 0; a < m; a++)
      for (let b = a; b < m; b++) normal[a * m + b] += basis[row + a] * basis[row + b];
  }
  const normalMatrix = new Matrix(m, m);
  for (let a = 0; a < m; a++)
    for (let b = 0; b < m; b++) normalMatrix.set(a, b, normal[Math.min(a, b) * m + Math.max(a, b)]);

  const working = Float64Array.from(y);
  let fit = new Float64Array(n);
  for (let iteration = 0; iteration < maxIterations; iteration++) {
    const moments = new Float64Array(m);
    for (let i = 0; i < n; i++) {
      const row = i * m;
      for (let a = 0; a < m; a++) moments[a] += basis[row + a] * working[i];
    }
    const coefficients = solve(normalMatrix, Matrix.columnVector(Array.from(moments))).getColumn(0);
    const next = new Float64Array(n);
    let changeSquares = 0;
    let fitSquares = 0;
    for (let i = 0; i < n; i++) {
      const row = i * m;
      let value = 0;
      for (let k = 0; k < m; k++) value += coefficients[k] * basis[row + k];
      next[i] = value;
      changeSquares += (value - fit[i]) ** 2;
      fitSquares += value * value;
      if (working[i] > value) working[i] = value;
    }
    const settled = iteration > 0 && changeSquares <= tolerance * tolerance * fitSquares;
    fit = next;
    if (settled) break;
  }
  return fit;
}
