// Sub-sample position and height of a peak from its three top samples, with the estimate's sensitivities.

export interface FitPeakTopOptions {
  /** Index of the top sample; 1 … length − 2. */
  index: number;
}

export interface PeakTop {
  /** Offset of the vertex from `index`, in samples, within [−0.5, 0.5]. */
  offset: number;
  /** Value at the vertex. */
  height: number;
  /** ∂offset/∂signal[index − 1], ∂offset/∂signal[index], ∂offset/∂signal[index + 1], for noise propagation. */
  gradient: [number, number, number];
  /** "gaussian": parabola through the logs (exact for a sampled Gaussian); "parabolic": through the values;
   * "flat": no curvature at the top (clipped), offset 0. */
  method: "gaussian" | "parabolic" | "flat";
}

/**
 * Vertex of the parabola through (−1, a), (0, b), (1, c): offset = (a − c) / (2(a − 2b + c)).
 * Taken on ln values when all three are positive (a Gaussian's log is a parabola, so its centre
 * comes back exactly), else on the values themselves.
 */
export function fitPeakTop(signal: Float64Array, options: FitPeakTopOptions): PeakTop {
  const { index } = options;
  if (!Number.isInteger(index) || index < 1 || index > signal.length - 2) {
    throw new RangeError(`index must be an integer in 1 … ${signal.length - 2} (got ${index})`);
  }
  const a = signal[index - 1];
  const b = signal[index];
  const c = signal[index + 1];
  const logarithmic = a > 0 && b > 0 && c > 0;
  const la = logarithmic ? Math.log(a) : a;
  const lb = logarithmic ? Math.log(b) : b;
  const lc = logarithmic ? Math.log(c) : c;
  const numerator = la - lc;
  const curvature = la - 2 * lb + lc;
  if (!(curvature < 0) || Math.abs(numerator) > -curvature) {
    return { offset: 0, height: b, gradient: [0, 0, 0], method: "flat" };
  }
  const offset = numerator / (2 * curvature);
  const vertex = lb - (numerator * numerator) / (8 * curvature);
  const height = logarithmic ? Math.exp(vertex) : vertex;
  // Partial derivatives of offset = N / (2D) with N = la − lc, D = la − 2lb + lc.
  const d2 = 2 * curvature * curvature;
  let ga = (curvature - numerator) / d2;
  let gb = (2 * numerator) / d2;
  let gc = (-curvature - numerator) / d2;
  if (logarithmic) {
    ga /= a;
    gb /= b;
    gc /= c;
  }
  return { offset, height, gradient: [ga, gb, gc], method: logarithmic ? "gaussian" : "parabolic" };
}
