// One entry point for continuum (baseline) removal, so callers pick a method by option, not by import.
import {
  asymmetricLeastSquares,
  type AsymmetricLeastSquaresOptions,
} from "./asymmetric-least-squares";
import { assertFiniteArray } from "./assert-finite-array";
import {
  modifiedPolynomialBaseline,
  type ModifiedPolynomialBaselineOptions,
} from "./modified-polynomial-baseline";

/** Which continuum model to use, with that model's own options. */
export type BaselineOptions =
  | ({ method: "asymmetricLeastSquares" } & AsymmetricLeastSquaresOptions)
  | ({ method: "modifiedPolynomial" } & ModifiedPolynomialBaselineOptions)
  | { method: "none" };

/** The continuum under `y` on axis `x` (same length; zeros for method "none"). */
export function estimateContinuum(
  x: Float64Array,
  y: Float64Array,
  options: BaselineOptions,
): Float64Array {
  assertFiniteArray(y, "y", 3);
  if (x.length !== y.length)
    throw new RangeError(`x and y differ in length (${x.length} vs ${y.length})`);
  switch (options.method) {
    case "asymmetricLeastSquares": {
      const { lambda, asymmetry, maxIterations } = options;
      return asymmetricLeastSquares(y, { lambda, asymmetry, maxIterations });
    }
    case "modifiedPolynomial": {
      const { degree, maxIterations, tolerance } = options;
      return modifiedPolynomialBaseline(x, y, { degree, maxIterations, tolerance });
    }
    case "none":
      return new Float64Array(y.length);
    default:
      throw new RangeError(
        `unknown baseline method ${String((options as { method: unknown }).method)}`,
      );
  }
}
