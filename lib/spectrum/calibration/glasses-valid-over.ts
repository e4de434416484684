// Which catalogue glasses may be evaluated over a wavelength range: inside the range the maker states
// the Sellmeier formula for, and with every resonance outside it. A glass outside its range is not a
// worse candidate but a meaningless one (near a resonance n(λ) runs off to infinity).
import { GLASS_CATALOGUE, GLASS_NAMES, type GlassName } from "./glass-catalogue";

/** Whether the Sellmeier terms of `glass` have no resonance inside [low, high] nm. */
function resonanceFree(glass: GlassName, [low, high]: readonly [number, number]): boolean {
  const { cUm2 } = GLASS_CATALOGUE[glass];
  const lowUm2 = (low / 1000) ** 2;
  const highUm2 = (high / 1000) ** 2;
  // Ultraviolet terms (Cᵢ < 1 µm²) must lie below the range, infrared ones above it.
  return cUm2.every((c) => (c < 1 ? c < lowUm2 : c > highUm2));
}

/**
 * The glasses of `glasses` (default: the catalogue) whose formula holds over all of `rangeNm`, in
 * catalogue order. With `resonancesOnly`, only the resonances must lie outside the range (enough for a
 * rough shape such as the pairing's first guess; the stated ranges are approximate).
 */
export function glassesValidOver(
  rangeNm: readonly [number, number],
  glasses: readonly GlassName[] = GLASS_NAMES,
  resonancesOnly = false,
): GlassName[] {
  const low = Math.min(rangeNm[0], rangeNm[1]);
  const high = Math.max(rangeNm[0], rangeNm[1]);
  if (!(Number.isFinite(low) && Number.isFinite(high) && low > 0)) return [];
  return glasses.filter((glass) => {
    const [validLow, validHigh] = GLASS_CATALOGUE[glass].validRangeNm;
    return (
      (resonancesOnly || (low >= validLow && high <= validHigh)) &&
      resonanceFree(glass, [low, high])
    );
  });
}
