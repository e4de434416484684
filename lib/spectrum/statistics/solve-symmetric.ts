// Solves a small symmetric positive-definite system (a damped normal matrix) by Cholesky factorisation,
// in plain arrays: the fits solve a 4×4 or 5×5 system at every damping they try, and a general matrix
// object per solve cost more than the arithmetic.

/**
 * x with A·x = b for a symmetric positive-definite A (its lower triangle is read); null when A is not
 * positive definite to working precision (a pivot that is not positive), as a singular damped system is.
 */
export function solveSymmetric(
  a: readonly (readonly number[])[],
  b: readonly number[],
): number[] | null {
  const n = b.length;
  // L, row by row, in one flat array: A = L·Lᵀ.
  const l = new Float64Array(n * n);
  for (let i = 0; i < n; i++) {
    for (let j = 0; j <= i; j++) {
      let sum = a[i][j];
      for (let k = 0; k < j; k++) sum -= l[i * n + k] * l[j * n + k];
      if (i === j) {
        if (!(sum > 0)) return null;
        l[i * n + i] = Math.sqrt(sum);
      } else {
        l[i * n + j] = sum / l[j * n + j];
      }
    }
  }
  // L·y = b, then Lᵀ·x = y.
  const x = new Array<number>(n);
  for (let i = 0; i < n; i++) {
    let sum = b[i];
    for (let k = 0; k < i; k++) sum -= l[i * n + k] * x[k];
    x[i] = sum / l[i * n + i];
  }
  for (let i = n - 1; i >= 0; i--) {
    let sum = x[i];
    for (let k = i + 1; k < n; k++) sum -= l[k * n + i] * x[k];
    x[i] = sum / l[i * n + i];
  }
  return x.every(Number.isFinite) ? x : null;
}
