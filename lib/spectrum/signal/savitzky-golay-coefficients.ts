// Savitzky–Golay weights for any evaluation point of the window: the centre for the interior,
// off-centre points for the edges (SciPy's "interp" edge mode) and for tests against the 1964 tables.
import { Matrix, MatrixTransposeView, inverse } from "ml-matrix";
import { assertIntegerInRange } from "./assert-integer-in-range";

export interface SavitzkyGolayCoefficientsOptions {
  /**
   * Number of samples in the window; odd.
   * @default 7
   */
  windowSize?: number;
  /**
   * Degree of the local least-squares polynomial; less than windowSize.
   * @default 2
   */
  polynomial?: number;
  /**
   * Order of the derivative to estimate; at most `polynomial`.
   * @default 0
   */
  derivative?: number;
  /**
   * Index inside the window (0 … windowSize − 1) at which the polynomial is evaluated.
   * @default (windowSize − 1) / 2, the centre
   */
  position?: number;
  /**
   * Sample spacing h; derivatives are divided by h^derivative.
   * @default 1
   */
  spacing?: number;
}

/** Weights already worked out, by shape (a few shapes serve every spectrum; bounded all the same). */
const computed = new Map<string, Float64Array>();
const MAX_COMPUTED = 512;

/**
 * Weights w such that Σ w[j]·y[j] over the window is the fitted polynomial's `derivative`-th
 * derivative at `position` ("dot" order: w[0] multiplies the first sample of the window). Each shape's
 * weights are worked out once (a least-squares projector per window position) and copied out after.
 */
export function savitzkyGolayCoefficients(
  options: SavitzkyGolayCoefficientsOptions = {},
): Float64Array {
  const { windowSize = 7, polynomial = 2, derivative = 0, spacing = 1 } = options;
  assertSavitzkyGolayShape(windowSize, polynomial, derivative);
  const half = (windowSize - 1) / 2;
  const { position = half } = options;
  if (!Number.isFinite(position) || position < 0 || position > windowSize - 1) {
    throw new RangeError(`position must lie in 0 … ${windowSize - 1} (got ${position})`);
  }
  if (!Number.isFinite(spacing) || spacing <= 0) {
    throw new RangeError(`spacing must be a positive finite number (got ${spacing})`);
  }
  const key = `${windowSize} ${polynomial} ${derivative} ${position} ${spacing}`;
  let weights = computed.get(key);
  if (!weights) {
    weights = projectorWeights(windowSize, polynomial, derivative, position, spacing);
    if (computed.size >= MAX_COMPUTED) computed.clear();
    computed.set(key, weights);
  }
  return weights.slice();
}

function projectorWeights(
  windowSize: number,
  polynomial: number,
  derivative: number,
  position: number,
  spacing: number,
): Float64Array {
  const half = (windowSize - 1) / 2;
  const design = new Matrix(windowSize, polynomial + 1);
  for (let j = 0; j < windowSize; j++) {
    for (let k = 0; k <= polynomial; k++) design.set(j, k, (j - half) ** k);
  }
  const transposed = new MatrixTransposeView(design);
  // Rows of (JᵀJ)⁻¹Jᵀ give the polynomial's coefficients as linear combinations of the samples.
  const projector = inverse(transposed.mmul(design)).mmul(transposed);
  const t = position - half;
  const weights = new Float64Array(windowSize);
  for (let k = derivative; k <= polynomial; k++) {
    // d^m/dt^m of t^k is k!/(k−m)! · t^(k−m).
    let factor = 1;
    for (let f = k - derivative + 1; f <= k; f++) factor *= f;
    const scale = (factor * t ** (k - derivative)) / spacing ** derivative;
    for (let j = 0; j < windowSize; j++) weights[j] += scale * projector.get(k, j);
  }
  return weights;
}

/** Throws a RangeError unless window, polynomial and derivative make a well-posed local fit. */
export function assertSavitzkyGolayShape(
  windowSize: number,
  polynomial: number,
  derivative: number,
): void {
  // Windows below 5 were always refused (ml-savitzky-golay's limit, once used here); callers rely on it.
  assertIntegerInRange(windowSize, "windowSize", 5);
  if (windowSize % 2 !== 1) throw new RangeError(`windowSize must be odd (got ${windowSize})`);
  assertIntegerInRange(polynomial, "polynomial", 1, windowSize - 1);
  assertIntegerInRange(derivative, "derivative", 0, polynomial);
}
