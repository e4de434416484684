// The degree of the forward polynomial that lamp pairing grows with, for the support it has so far.
import type { DispersionKind } from "../types";

/** The model's degree for the support so far: straight over a short stretch, bending as it widens. */
export function growthDegree(
  pairCount: number,
  coveredFraction: number,
  dispersion: DispersionKind,
): number {
  let degree = 1;
  if (pairCount >= 4 && coveredFraction >= 0.12) degree = 2;
  if (pairCount >= 7 && coveredFraction >= 0.3) degree = 3;
  if (dispersion === "prism" && pairCount >= 10 && coveredFraction >= 0.5) degree = 4;
  if (dispersion === "prism" && pairCount >= 14 && coveredFraction >= 0.7) degree = 5;
  return Math.min(degree, pairCount - 2);
}
