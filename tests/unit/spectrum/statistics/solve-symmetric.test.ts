// The small symmetric solve of the fits' damped normal equations, against ml-matrix's general LU solve.
import { Matrix, solve } from "ml-matrix";
import { describe, expect, it } from "vitest";
import { makeRandom } from "@/lib/spectrum/statistics/make-random";
import { solveSymmetric } from "@/lib/spectrum/statistics/solve-symmetric";

describe("solveSymmetric", () => {
  it("agrees with ml-matrix's LU solve on damped normal matrices of 2 to 6 parameters", () => {
    const random = makeRandom(7);
    for (let trial = 0; trial < 200; trial++) {
      const n = 2 + (trial % 5);
      const rows = 3 * n;
      // JᵀJ of a random Jacobian whose columns differ in scale by up to 10⁶, damped as the fits damp it.
      const scales = Array.from({ length: n }, () => 10 ** (6 * random.uniform() - 3));
      const jacobian = Array.from({ length: rows }, () =>
        scales.map((s) => s * (2 * random.uniform() - 1)),
      );
      const normal = scales.map((_, j) =>
        scales.map((_, k) => jacobian.reduce((sum, row) => sum + row[j] * row[k], 0)),
      );
      normal.forEach((row, j) => (row[j] *= 1 + 1e-3));
      const b = scales.map(() => 2 * random.uniform() - 1);
      const ours = solveSymmetric(normal, b)!;
      const reference = solve(new Matrix(normal), Matrix.columnVector(b)).getColumn(0);
      ours.forEach((value, j) => {
        // Both are backward stable; the answers agree to the system's condition times ε.
        expect(Math.abs(value - reference[j])).toBeLessThanOrEqual(
          1e-6 * Math.max(...reference.map(Math.abs)),
        );
      });
    }
  });

  it("gives null for a matrix that is not positive definite", () => {
    expect(
      solveSymmetric(
        [
          [1, 2],
          [2, 1],
        ],
        [1, 1],
      ),
    ).toBeNull();
    expect(
      solveSymmetric(
        [
          [1, 1],
          [1, 1],
        ],
        [1, 1],
      ),
    ).toBeNull();
    expect(solveSymmetric([[0]], [1])).toBeNull();
    expect(
      solveSymmetric(
        [
          [4, 2],
          [2, 3],
        ],
        [2, 1],
      ),
    ).toEqual([0.5, 0]);
    // Only the lower triangle is read.
    expect(
      solveSymmetric(
        [
          [4, 99],
          [2, 3],
        ],
        [2, 1],
      ),
    ).toEqual([0.5, 0]);
  });
});
