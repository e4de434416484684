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

/** Scratch arrays for repeated solves (the baseline solves ten in a row): each at least as long as
 * the system; every entry a solve reads it has written first, so one workspace serves any smaller size. */
export interface PentadiagonalWorkspace {
  pivots: Float64Array;
  lower1: Float64Array;
  lower2: Float64Array;
}

/** A workspace for systems of up to n unknowns. */
export function pentadiagonalWorkspace(n: number): PentadiagonalWorkspace {
  return {
    pivots: new Float64Array(n),
    lower1: new Float64Array(n),
    lower2: new Float64Array(n),
  };
}

/**
 * Solves A·x = rhs by an LDLᵀ factorisation that keeps only the two sub-diagonals of L,
 * so time and memory stay linear (a dense solve at a million points is out of the question).
 * A must be symmetric positive definite; a non-positive pivot throws a RangeError. `out` (of length n)
 * receives x, a new array when omitted; `workspace` holds the factors, fresh ones when omitted. After
 * a RangeError for a pivot, `out` holds a partly done forward pass.
 */
export function solveSymmetricPentadiagonal(
  matrix: SymmetricPentadiagonal,
  rhs: Float64Array,
  out: Float64Array = new Float64Array(matrix.diagonal.length),
  workspace: PentadiagonalWorkspace = pentadiagonalWorkspace(matrix.diagonal.length),
): Float64Array {
  const { diagonal, upper1, upper2 } = matrix;
  const n = diagonal.length;
  const { pivots: d, lower1: l1, lower2: l2 } = workspace;
  if (
    rhs.length !== n ||
    out.length !== n ||
    d.length < n ||
    l1.length < n ||
    l2.length < n ||
    (n > 1 && upper1.length < n - 1) ||
    (n > 2 && upper2.length < n - 2)
  ) {
    throw new RangeError(
      `lengths do not match: n = ${n}, rhs ${rhs.length}, bands ${upper1.length}/${upper2.length}, ` +
        `out ${out.length}, workspace ${Math.min(d.length, l1.length, l2.length)}`,
    );
  }
  // One loop factorises and substitutes forwards. The previous rows' factors and unknowns are carried
  // in the locals below, which start at 0, so the first two rows need no case of their own; the last
  // two set their couplings past the matrix's edge to 0, which the backward pass then multiplies.
  const x = out;
  let d2 = 0,
    d1 = 0,
    a2 = 0,
    a1 = 0,
    b1 = 0,
    x2 = 0,
    x1 = 0;
  for (let i = 0; i < n; i++) {
    const pivot = diagonal[i] - a1 * a1 * d1 - a2 * a2 * d2;
    if (!(pivot > 0))
      throw new RangeError(`matrix is not positive definite (pivot ${pivot} at row ${i})`);
    d[i] = pivot;
    const coupling = i < n - 1 ? (upper1[i] - a1 * b1 * d1) / pivot : 0;
    const skip = i < n - 2 ? upper2[i] / pivot : 0;
    l1[i] = coupling;
    l2[i] = skip;
    // Forward substitution with L, in the same pass.
    const value = rhs[i] - a1 * x1 - a2 * x2;
    x[i] = value;
    d2 = d1;
    d1 = pivot;
    a2 = b1;
    a1 = coupling;
    b1 = skip;
    x2 = x1;
    x1 = value;
  }
  // Division by D, then back substitution with Lᵀ.
  let y1 = 0,
    y2 = 0;
  for (let i = n - 1; i >= 0; i--) {
    const value = x[i] / d[i] - l1[i] * y1 - l2[i] * y2;
    x[i] = value;
    y2 = y1;
    y1 = value;
  }
  return x;
}
