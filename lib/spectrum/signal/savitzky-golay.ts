// Savitzky–Golay smoothing and derivatives over a whole spectrum, same length out as in.
import savitzkyGolayFilter from "ml-savitzky-golay";
import { assertFiniteArray } from "./assert-finite-array";
import { assertSavitzkyGolayShape, savitzkyGolayCoefficients } from "./savitzky-golay-coefficients";

export interface SavitzkyGolayOptions {
  /**
   * Number of samples in the window; odd, at least 5 (ml-savitzky-golay's minimum), at most y.length.
   * @default 7
   */
  windowSize?: number;
  /**
   * Degree of the local polynomial; 1 … windowSize − 1.
   * @default 2
   */
  polynomial?: number;
  /**
   * Derivative order; 0 smooths, 1 and 2 give slope and curvature. At most `polynomial`.
   * @default 0
   */
  derivative?: number;
  /**
   * Sample spacing h in x units; derivatives are per x unit. Use 1 to work per sample, which is
   * what a non-uniform wavelength axis needs (convert with the local dx afterwards).
   * @default 1
   */
  spacing?: number;
  /**
   * How the first and last windowSize/2 samples are treated:
   * "polynomial" evaluates the fit of the first (last) full window off-centre (SciPy's mode "interp");
   * "nearest" repeats the end samples before filtering (SciPy's mode "nearest").
   * @default "polynomial"
   */
  edges?: "polynomial" | "nearest";
}

/**
 * Savitzky–Golay (1964) filter of `y`. The interior is computed by ml-savitzky-golay (which
 * returns only the n − windowSize + 1 fully covered points); the edges are filled here.
 */
export function savitzkyGolay(y: Float64Array, options: SavitzkyGolayOptions = {}): Float64Array {
  const { windowSize = 7, polynomial = 2, derivative = 0, spacing = 1, edges = "polynomial" } = options;
  assertSavitzkyGolayShape(windowSize, polynomial, derivative);
  assertFiniteArray(y, "y", windowSize);
  if (!Number.isFinite(spacing) || spacing <= 0) {
    throw new RangeError(`spacing must be a positive finite number (got ${spacing})`);
  }
  if (edges !== "polynomial" && edges !== "nearest") {
    throw new RangeError(`edges must be "polynomial" or "nearest" (got ${String(edges)})`);
  }
  const n = y.length;
  const half = (windowSize - 1) / 2;
  const packageOptions = { windowSize, polynomial, derivative, pad: "none" as const };

  if (edges === "nearest") {
    const padded = new Float64Array(n + 2 * half);
    padded.fill(y[0], 0, half);
    padded.set(y, half);
    padded.fill(y[n - 1], half + n);
    // The package only indexes its input in "none" mode, so a typed array can stand in for number[].
    return Float64Array.from(savitzkyGolayFilter(padded as unknown as number[], spacing, packageOptions));
  }

  const out = new Float64Array(n);
  out.set(savitzkyGolayFilter(y as unknown as number[], spacing, packageOptions), half);
  for (let i = 0; i < half; i++) {
    const head = savitzkyGolayCoefficients({ windowSize, polynomial, derivative, spacing, position: i });
    const tail = savitzkyGolayCoefficients({
      windowSize,
      polynomial,
      derivative,
      spacing,
      position: windowSize - 1 - i,
    });
    let first = 0;
    let last = 0;
    for (let j = 0; j < windowSize; j++) {
      first += head[j] * y[j];
      last += tail[j] * y[n - windowSize + j];
    }
    out[i] = first;
    out[n - 1 - i] = last;
  }
  return out;
}
