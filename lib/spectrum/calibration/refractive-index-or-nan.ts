// The Sellmeier index where the formula holds and NaN beyond a resonance, without throwing: the prism
// model's inverse tabulates x(λ) over 200–2500 nm, where most glasses have no index at one end, and an
// error built (with its stack) for every such point cost more than the physics.
import type { SellmeierGlass } from "./glass-catalogue";

/** n(λ) = sqrt(1 + Σ Bᵢλ²/(λ² − Cᵢ)) with λ in µm; NaN across or beyond a resonance, or for λ ≤ 0. */
export function refractiveIndexOrNaN(coefficients: SellmeierGlass, wavelengthNm: number): number {
  if (!(wavelengthNm > 0) || !Number.isFinite(wavelengthNm)) return Number.NaN;
  const lambdaUm2 = (wavelengthNm / 1000) ** 2;
  let nSquaredMinusOne = 0;
  for (let i = 0; i < 3; i++) {
    const resonanceUm2 = coefficients.cUm2[i];
    const denominator = lambdaUm2 - resonanceUm2;
    // The terms with Cᵢ < 1 µm² are ultraviolet resonances (λ must lie above them), the others infrared
    // ones (λ must lie below); across a resonance the formula has no physical meaning.
    if (resonanceUm2 < 1 ? denominator <= 0 : denominator >= 0) return Number.NaN;
    nSquaredMinusOne += (coefficients.b[i] * lambdaUm2) / denominator;
  }
  return Math.sqrt(1 + nSquaredMinusOne);
}
