// Continuum removal: the banded solver against a dense solve, and both baselines recovering a known continuum.
import { describe, it, expect } from "vitest";
import { Matrix, solve } from "ml-matrix";
import {
  asymmetricLeastSquares,
  defaultBaselineFor,
  estimateContinuum,
  modifiedPolynomialBaseline,
  solveSymmetricPentadiagonal,
} from "@/lib/spectrum/signal";
import { pentadiagonalWorkspace } from "@/lib/spectrum/signal/solve-symmetric-pentadiagonal";
import { SOURCE_KINDS } from "@/lib/spectrum/types";
import { makeRandom } from "@/lib/spectrum/statistics/make-random";

function lines(i: number): number {
  return (
    400 * Math.exp(-0.5 * ((i - 300) / 2.5) ** 2) +
    900 * Math.exp(-0.5 * ((i - 1100) / 3) ** 2) +
    250 * Math.exp(-0.5 * ((i - 1500) / 4) ** 2)
  );
}

/** LDLᵀ of a symmetric pentadiagonal matrix in three passes (factorise, forward, divide and back). */
function threePassSolve(
  diagonal: Float64Array,
  upper1: Float64Array,
  upper2: Float64Array,
  rhs: Float64Array,
): Float64Array {
  const n = diagonal.length;
  const d = new Float64Array(n);
  const l1 = new Float64Array(n);
  const l2 = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    let pivot = diagonal[i];
    if (i >= 1) pivot -= l1[i - 1] * l1[i - 1] * d[i - 1];
    if (i >= 2) pivot -= l2[i - 2] * l2[i - 2] * d[i - 2];
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

describe("solveSymmetricPentadiagonal", () => {
  it("agrees with a dense solve on random diagonally dominant systems, the edge sizes too", () => {
    const { uniform } = makeRandom(5);
    // One workspace for every size, filled with NaN before each reuse: a solve that read an entry it
    // had not written first would answer NaN (the baseline reuses it for its ten passes).
    const workspace = pentadiagonalWorkspace(30);
    for (const n of [1, 2, 3, 4, 30, 17]) {
      const diagonal = Float64Array.from({ length: n }, () => 10 + uniform());
      const upper1 = Float64Array.from({ length: Math.max(n - 1, 0) }, () => uniform() * 2 - 1);
      const upper2 = Float64Array.from({ length: Math.max(n - 2, 0) }, () => uniform() * 2 - 1);
      const rhs = Float64Array.from({ length: n }, () => uniform() * 10);
      const dense = Matrix.zeros(n, n);
      for (let i = 0; i < n; i++) {
        dense.set(i, i, diagonal[i]);
        if (i < n - 1) dense.set(i, i + 1, upper1[i]).set(i + 1, i, upper1[i]);
        if (i < n - 2) dense.set(i, i + 2, upper2[i]).set(i + 2, i, upper2[i]);
      }
      const expected = solve(dense, Matrix.columnVector(Array.from(rhs))).getColumn(0);
      const fresh = solveSymmetricPentadiagonal({ diagonal, upper1, upper2 }, rhs);
      fresh.forEach((v, i) => expect(v).toBeCloseTo(expected[i], 10));
      // The same factorisation written the textbook way, one pass each: the same operations in the
      // same order, so the same numbers to the last bit.
      expect(Array.from(fresh)).toEqual(Array.from(threePassSolve(diagonal, upper1, upper2, rhs)));
      for (const scratch of Object.values(workspace)) scratch.fill(Number.NaN);
      const reused = solveSymmetricPentadiagonal(
        { diagonal, upper1, upper2 },
        rhs,
        new Float64Array(n).fill(Number.NaN),
        workspace,
      );
      expect(Array.from(reused)).toEqual(Array.from(fresh));
    }
  });

  it("refuses an output of another length, or a workspace shorter than the system", () => {
    const system = {
      diagonal: Float64Array.of(4, 4, 4),
      upper1: Float64Array.of(1, 1),
      upper2: Float64Array.of(0.5),
    };
    const rhs = Float64Array.of(1, 2, 3);
    expect(() => solveSymmetricPentadiagonal(system, rhs, new Float64Array(2))).toThrow(/out 2/);
    expect(() =>
      solveSymmetricPentadiagonal(system, rhs, new Float64Array(3), pentadiagonalWorkspace(2)),
    ).toThrow(/workspace 2/);
  });

  it("refuses a matrix that is not positive definite", () => {
    expect(() =>
      solveSymmetricPentadiagonal(
        {
          diagonal: Float64Array.of(1, -1, 1),
          upper1: new Float64Array(2),
          upper2: new Float64Array(1),
        },
        new Float64Array(3),
      ),
    ).toThrow(RangeError);
  });
});

describe("asymmetricLeastSquares", () => {
  it("recovers a curved flame-like continuum under lines within 2 % of the line heights", () => {
    const n = 2048;
    const { normal } = makeRandom(9);
    const continuum = (i: number) => 300 + 0.15 * i + 120 * Math.sin(i / 500);
    const y = Float64Array.from({ length: n }, (_, i) => continuum(i) + lines(i) + 2 * normal());
    const baseline = asymmetricLeastSquares(y);
    let worst = 0;
    for (let i = 20; i < n - 20; i++) worst = Math.max(worst, Math.abs(baseline[i] - continuum(i)));
    // Tolerance stated: 2 % of the 900-count line, i.e. 18 counts, away from the array ends.
    expect(worst).toBeLessThan(18);
  });

  it("handles a million points (banded solve, linear memory)", () => {
    const n = 1_000_000;
    const y = Float64Array.from({ length: n }, (_, i) => 100 + 1e-4 * i + lines(i % 2000));
    const baseline = asymmetricLeastSquares(y, { maxIterations: 3 });
    expect(baseline.length).toBe(n);
    expect(Math.abs(baseline[500_000] - (100 + 50))).toBeLessThan(10);
  });

  it("rejects bad parameters", () => {
    const y = new Float64Array(10);
    expect(() => asymmetricLeastSquares(y, { lambda: -1 })).toThrow(RangeError);
    expect(() => asymmetricLeastSquares(y, { asymmetry: 0.7 })).toThrow(RangeError);
    expect(() => asymmetricLeastSquares(y, { maxIterations: 0 })).toThrow(RangeError);
  });
});

describe("modifiedPolynomialBaseline", () => {
  it("recovers a cubic continuum on a wavelength axis under lines within 1 % of the line heights", () => {
    const n = 1500;
    const { normal } = makeRandom(3);
    const x = Float64Array.from({ length: n }, (_, i) => 400 + i * 0.2 + 1e-5 * i * i);
    const continuum = (w: number) =>
      50 + 0.8 * (w - 400) - 0.002 * (w - 400) ** 2 + 4e-6 * (w - 400) ** 3;
    const y = Float64Array.from({ length: n }, (_, i) => continuum(x[i]) + lines(i) + normal());
    const baseline = modifiedPolynomialBaseline(x, y, { degree: 3 });
    let worst = 0;
    for (let i = 0; i < n; i++) worst = Math.max(worst, Math.abs(baseline[i] - continuum(x[i])));
    expect(worst).toBeLessThan(9);
  });
});

describe("defaultBaselineFor and estimateContinuum", () => {
  it("gives every source kind a usable method, and 'none' gives zeros", () => {
    const x = Float64Array.from({ length: 200 }, (_, i) => i);
    const y = Float64Array.from({ length: 200 }, (_, i) => 10 + 0.1 * i + lines(i + 200));
    for (const source of SOURCE_KINDS) {
      const continuum = estimateContinuum(x, y, defaultBaselineFor(source));
      expect(continuum.every(Number.isFinite)).toBe(true);
    }
    expect(defaultBaselineFor("flame").method).toBe("asymmetricLeastSquares");
    expect(defaultBaselineFor("lamp").method).toBe("modifiedPolynomial");
    expect(Array.from(estimateContinuum(x, y, { method: "none" })).every((v) => v === 0)).toBe(
      true,
    );
  });
});
