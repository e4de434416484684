// The continuum model each kind of source gets unless the chemist chooses otherwise.
import type { SourceKind } from "../types";
import type { BaselineOptions } from "./estimate-continuum";

/**
 * Default continuum removal per kind of source.
 *
 * - flame: asymmetric least squares, λ = 1e6, p = 0.01 — a flame's background (hot-particle
 *   glow, OH/CH/C₂ band wings) is broad but curved and uneven, which a low-order polynomial
 *   follows poorly; ALS bends with it over ~200 samples while lines a few samples wide ride above.
 * - arc, spark, plasma: asymmetric least squares, λ = 1e5, p = 0.005 — their recombination and
 *   bremsstrahlung continuum changes faster across the range, and the many lines call for a
 *   smaller p so the line forest does not lift the baseline.
 * - lamp: modified polynomial of degree 3 — a reference lamp sits on a dark, smooth background
 *   (dark current, stray light); a stiff polynomial cannot creep up into dense Ne/Ar line clusters.
 */
export function defaultBaselineFor(source: SourceKind): BaselineOptions {
  switch (source) {
    case "flame":
      return { method: "asymmetricLeastSquares", lambda: 1e6, asymmetry: 0.01, maxIterations: 10 };
    case "arc":
    case "spark":
    case "plasma":
      return { method: "asymmetricLeastSquares", lambda: 1e5, asymmetry: 0.005, maxIterations: 10 };
    case "lamp":
      return { method: "modifiedPolynomial", degree: 3, maxIterations: 100, tolerance: 0.001 };
    default:
      throw new RangeError(`unknown source kind ${String(source)}`);
  }
}
