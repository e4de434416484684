// Savitzky–Golay smoothing and derivatives over a whole spectrum, same length out as in.
import { assertFiniteArray } from "./assert-finite-array";
import { assertSavitzkyGolayShape, savitzkyGolayCoefficients } from "./savitzky-golay-coefficients";

export interface SavitzkyGolayOptions {
  /**
   * Number of samples in the window; odd, at least 5, at most y.length.
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
 * Savitzky–Golay (1964) filter of `y`. The interior is one convolution with the centre weights of
 * savitzkyGolayCoefficients (checked against SciPy's savgol_coeffs); the edges are filled with the
 * off-centre weights of the first and last full windows.
 */
export function savitzkyGolay(y: Float64Array, options: SavitzkyGolayOptions = {}): Float64Array {
  const {
    windowSize = 7,
    polynomial = 2,
    derivative = 0,
    spacing = 1,
    edges = "polynomial",
  } = options;
  assertSavitzkyGolayShape(windowSize, polynomial, derivative);
  // Finiteness is checked by the convolution below (a NaN or ±Infinity spoils every window over it),
  // which saves a pass over y; the type and length are checked here.
  if (!(y instanceof Float64Array) || y.length < windowSize) assertFiniteArray(y, "y", windowSize);
  if (!Number.isFinite(spacing) || spacing <= 0) {
    throw new RangeError(`spacing must be a positive finite number (got ${spacing})`);
  }
  if (edges !== "polynomial" && edges !== "nearest") {
    throw new RangeError(`edges must be "polynomial" or "nearest" (got ${String(edges)})`);
  }
  const n = y.length;
  const half = (windowSize - 1) / 2;
  const centre = savitzkyGolayCoefficients({ windowSize, polynomial, derivative, spacing });

  if (edges === "nearest") {
    const padded = new Float64Array(n + 2 * half);
    padded.fill(y[0], 0, half);
    padded.set(y, half);
    padded.fill(y[n - 1], half + n);
    const out = new Float64Array(n);
    if (!convolveValid(padded, centre, out, 0)) assertFiniteArray(y, "y", windowSize);
    return out;
  }

  const out = new Float64Array(n);
  if (!convolveValid(y, centre, out, half)) assertFiniteArray(y, "y", windowSize);
  for (let i = 0; i < half; i++) {
    const head = savitzkyGolayCoefficients({
      windowSize,
      polynomial,
      derivative,
      spacing,
      position: i,
    });
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

/**
 * out[offset + k] = Σ weights[j]·input[k + j] for every fully covered k, summed in j order; false when
 * an output is not finite (possibly only an overflow; the caller then checks the input itself). Eight
 * outputs share each pass over the weights, which cuts the loads per output; the package's loop
 * divided every term and wrote a number[] that then had to be copied.
 */
function convolveValid(
  input: Float64Array,
  weights: Float64Array,
  out: Float64Array,
  offset: number,
): boolean {
  const width = weights.length;
  const count = input.length - width + 1;
  // s·0 is 0 for finite s and NaN otherwise, so the probe stays 0 only if every output is finite.
  let probe = 0;
  let k = 0;
  for (; k + 7 < count; k += 8) {
    let s0 = 0;
    let s1 = 0;
    let s2 = 0;
    let s3 = 0;
    let s4 = 0;
    let s5 = 0;
    let s6 = 0;
    let s7 = 0;
    for (let j = 0; j < width; j++) {
      const w = weights[j];
      const p = k + j;
      s0 += w * input[p];
      s1 += w * input[p + 1];
      s2 += w * input[p + 2];
      s3 += w * input[p + 3];
      s4 += w * input[p + 4];
      s5 += w * input[p + 5];
      s6 += w * input[p + 6];
      s7 += w * input[p + 7];
    }
    const o = offset + k;
    out[o] = s0;
    out[o + 1] = s1;
    out[o + 2] = s2;
    out[o + 3] = s3;
    out[o + 4] = s4;
    out[o + 5] = s5;
    out[o + 6] = s6;
    out[o + 7] = s7;
    probe += (s0 + s1 + s2 + s3 + s4 + s5 + s6 + s7) * 0;
  }
  for (; k < count; k++) {
    let sum = 0;
    for (let j = 0; j < width; j++) sum += weights[j] * input[k + j];
    out[offset + k] = sum;
    probe += sum * 0;
  }
  return probe === 0;
}
