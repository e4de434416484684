// O(n) solver for the symmetric positive-definite pentadiagonal systems of the Whittaker/ALS baseline.

/** The three distinct bands of a symmetric pentadiagonal matrix A. */
export interface SymmetricPentadiagonal {
  /** A[i][i], length n. */
  diagonal: Float64Array;
  /** A[i][i+1] = A[i+1][i], length n − 1. */
  upper1: Float64Array;
  /** A[i][i+2] = A[i+2][i], length n − 2. */
  upper2: Float64Array;
}

/**
 * Solves A·x = rhs by an LDLᵀ factorisation that keeps only the two sub-diagonals of L,
 * so time and memory stay linear (a dense solve at a million points is out of the question).
 * A must be symmetric positive definite; a non-positive pivot throws a RangeError.
 */
export function solveSymmetricPentadiagonal(
  matrix: SymmetricPentadiagonal,
  rhs: Float64Array,
): Float64Array {
  const { diagonal, upper1, upper2 } = matrix;
  const n = diagonal.length;
  if (rhs.length !== n || (n > 1 && upper1.length < n - 1) || (n > 2 && upper2.length < n - 2)) {
    throw new RangeError(
      `band lengths do not match: n = ${n}, rhs ${rhs.length}, bands ${upper1.length}/${upper2.length}`,
    );
  }
  const d = new Float64Array(n);
  const l1 = new Float64Array(Math.max(n - 1, 0));
  const l2 = new Float64Array(Math.max(n - 2, 0));
  for (let i = 0; i < n; i++) {
    let pivot = diagonal[i];
    if (i >= 1) pivot -= l1[i - 1] * l1[i - 1] * d[i - 1];
    if (i >= 2) pivot -= l2[i - 2] * l2[i - 2] * d[i - 2];
    if (!(pivot > 0))
      throw new RangeError(`matrix is not positive definite (pivot ${pivot} at row ${i})`);
    d[i] = pivot;
    if (i < n - 1) {
      let coupling = upper1[i];
      if (i >= 1) coupling -= l1[i - 1] * l2[i - 1] * d[i - 1];
      l1[i] = coupling / pivot;
    }
    if (i < n - 2) l2[i] = upper2[i] / pivot;
  }
  const x = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    let value = rhs[i];
    if (i >= 1) value -= l1[i - 1] * x[i - 1];
    if (i >= 2) value -= l2[i - 2] * x[i - 2];
    x[i] = value;
  }
  for (let i = 0; i < n; i++) x[i] /= d[i];
  for (let i = n - 1; i >= 0; i--) {
    if (i < n - 1) x[i] -= l1[i] * x[i + 1];
    if (i < n - 2) x[i] -= l2[i] * x[i + 2];
  }
  return x;
}
