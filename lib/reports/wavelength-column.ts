// Wavelengths in a table at one precision that their uncertainties support: every row of a column gets
// the same number of decimals (a column that changes its decimals from row to row misreads as a change
// of precision), taken from the column's median uncertainty at two significant digits (the GUM's
// rounding, see round-to-uncertainty.ts). The uncertainties are written to the same place.
import { median } from "@/lib/spectrum/statistics/median";
import { decimalsForUncertainty } from "./round-to-uncertainty";

/** Decimals when no row has a usable uncertainty: a thousandth of a nm, the table's habit. */
export const FALLBACK_WAVELENGTH_DECIMALS = 3;
/** Bounds: never coarser than 0.1 nm nor finer than 0.00001 nm, whatever an uncertainty claims. */
const MIN_DECIMALS = 1;
const MAX_DECIMALS = 5;

/** The decimals of a wavelength column whose rows carry these uncertainties (in nm). */
export function wavelengthColumnDecimals(uncertaintiesNm: readonly number[]): number {
  const usable = uncertaintiesNm.filter((u) => Number.isFinite(u) && u > 0);
  if (usable.length === 0) return FALLBACK_WAVELENGTH_DECIMALS;
  const decimals = decimalsForUncertainty(median(usable))!;
  return Math.min(MAX_DECIMALS, Math.max(MIN_DECIMALS, decimals));
}

/** Each row's wavelength and uncertainty as text, all at the column's decimals. */
export function formatWavelengthColumn(
  rows: readonly { wavelengthNm: number; uncertaintyNm: number }[],
): { decimals: number; wavelengths: string[]; uncertainties: string[] } {
  const decimals = wavelengthColumnDecimals(rows.map((r) => r.uncertaintyNm));
  return {
    decimals,
    wavelengths: rows.map((r) => r.wavelengthNm.toFixed(decimals)),
    uncertainties: rows.map((r) => r.uncertaintyNm.toFixed(decimals)),
  };
}
