// A glass the catalogue does not hold, described by Sellmeier terms fitted from the pairs: one
// ultraviolet resonance (the electronic absorption, whose strength B₁ and place C₁ set the index and
// its rise into the blue) and one infrared resonance (the lattice absorption, whose strength B₃ bends
// the red end), n² = 1 + B₁λ²/(λ² − C₁) + B₃λ²/(λ² − C₃). Across the visible the infrared term acts
// as −B₃λ²/C₃, so its place is fixed at 100 µm², near the optical glasses' (N-BK7's 104 and F2's
// 112 µm² in SCHOTT's data sheets, from memory), and B₃ absorbs a crystal's farther one. B₃ is left
// free in sign: where one ultraviolet term stands in for a glass's two, a negative B₃ takes up the
// curvature left (clamped at zero, the start for F2 missed its index by enough that 4 of 5 F2 prisms'
// fits from it stalled tens of accuracies off).
// Measured on the first 100 prisms of the realistic-lamp generator (seed 12100000), fitted to 41
// points of their true axes: the 26 of N-LASF9, N-SF6 and sapphire, none in the catalogue, were
// missed by the best catalogue glass by a median 0.63, 0.83 and 1.8 times the calibration's accuracy
// (at worst 2.8); with these terms fitted, by 0.09, 0.06 and 0.01 (at worst 0.25).
import { GLASS_CATALOGUE, type GlassName, type SellmeierGlass } from "./glass-catalogue";
import { brentMinimum } from "./brent-minimum";
import { refractiveIndexOrNaN } from "./refractive-index-or-nan";
import { dot } from "../statistics/dot";

/** Place of the fitted glass's infrared resonance, µm². */
const FITTED_GLASS_INFRARED_UM2 = 100;

/** Names of the fitted glass's parameters, in the order the prism model appends them. */
export const FITTED_GLASS_PARAMETERS = ["sellmeierB1", "sellmeierC1Um2", "sellmeierB3"] as const;

/** A fitted-glass prism model's terms [B₁, C₁, B₃]: its last parameters. */
export function fittedGlassTermsOf(parameters: readonly number[]): number[] {
  return parameters.slice(parameters.length - FITTED_GLASS_PARAMETERS.length);
}

/** Largest place C₁ of the ultraviolet resonance, µm²: a tenth of the bluest pair's λ² below it. */
export function maxUltravioletResonanceUm2(bluestNm: number): number {
  return 0.9 * (bluestNm / 1000) ** 2;
}

/**
 * The fitted glass [B₁, C₁ (µm²), B₃] as Sellmeier coefficients the index formula reads; its stated
 * range is only where the formula holds (between the two resonances), not where the pairs vouch for it.
 */
export function fittedGlassCoefficients(terms: readonly number[]): SellmeierGlass {
  const [b1, c1, b3] = terms;
  return {
    name: "fitted glass",
    b: [b1, 0, b3],
    cUm2: [c1, 0, FITTED_GLASS_INFRARED_UM2],
    validRangeNm: [1000 * Math.sqrt(Math.max(c1, 0)), 1000 * Math.sqrt(FITTED_GLASS_INFRARED_UM2)],
    source: "fitted from the calibration's pairs",
  };
}

/**
 * [B₁, C₁, B₃] whose index matches a catalogue glass's over `rangeNm`, where a fit starts: for each
 * place C₁ the strengths are a linear least-squares fit of n² − 1, and C₁ is searched between the
 * deep ultraviolet and the bluest wavelength (Brent's method on the squared misfit).
 */
export function fittedGlassStart(
  glass: GlassName,
  [lowNm, highNm]: readonly [number, number],
): [number, number, number] {
  const coefficients = GLASS_CATALOGUE[glass];
  const samples = Array.from({ length: 24 }, (_, i) => lowNm + ((highNm - lowNm) * i) / 23);
  const lambdaUm2 = samples.map((nm) => (nm / 1000) ** 2);
  const target = samples.map((nm) => refractiveIndexOrNaN(coefficients, nm) ** 2 - 1);
  const infrared = lambdaUm2.map((l2) => l2 / (l2 - FITTED_GLASS_INFRARED_UM2));
  const strengthsAt = (c1: number) => {
    const ultraviolet = lambdaUm2.map((l2) => l2 / (l2 - c1));
    // Normal equations of two columns.
    const [uu, ui, ii] = [
      dot(ultraviolet, ultraviolet),
      dot(ultraviolet, infrared),
      dot(infrared, infrared),
    ];
    const [ut, it] = [dot(ultraviolet, target), dot(infrared, target)];
    const determinant = uu * ii - ui * ui;
    const b1 = (ut * ii - it * ui) / determinant;
    const b3 = (uu * it - ui * ut) / determinant;
    const misfit = target.reduce(
      (sum, t, i) => sum + (t - b1 * ultraviolet[i] - b3 * infrared[i]) ** 2,
      0,
    );
    return { b1, b3, misfit };
  };
  const c1 = brentMinimum(
    (c) => strengthsAt(c).misfit,
    1e-4,
    maxUltravioletResonanceUm2(lowNm),
    1e-7,
  );
  const { b1, b3 } = strengthsAt(c1);
  return [b1, c1, b3];
}
