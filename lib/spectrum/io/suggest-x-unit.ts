// Suggests (never decides) the unit of an x axis from its numbers, for a caller to confirm and pass back.
import type { AxisUnit } from "../types";

export interface XUnitSuggestion {
  /** The suggested unit. */
  unit: AxisUnit;
  /** Why, in words a person can check. */
  reason: string;
}

export interface SuggestXUnitOptions {
  /**
   * Fewest values needed before a suggestion is made.
   * @default 3
   */
  minLength?: number;
}

/**
 * "pixel" when x is the integers 0, 1, 2, … or 1, 2, 3, … (a line array's pixel indices), in either
 * direction; null otherwise. Wavelength and wavenumber ranges overlap (Å 2000–12000, cm⁻¹ 8000–50000),
 * so no wavelength unit is ever suggested.
 */
export function suggestXUnit(
  x: ArrayLike<number>,
  options: SuggestXUnitOptions = {},
): XUnitSuggestion | null {
  const { minLength = 3 } = options;
  if (x.length < minLength || x.length < 2) return null;
  const first = x[0];
  const step = x[1] - first;
  if (
    (first !== 0 && first !== 1 && first !== x.length - 1 && first !== x.length) ||
    Math.abs(step) !== 1
  )
    return null;
  for (let i = 0; i < x.length; i++) {
    if (x[i] !== first + i * step) return null;
  }
  const low = Math.min(first, x[x.length - 1]);
  return {
    unit: "pixel",
    reason: `the values are the integers ${low} to ${low + x.length - 1} in steps of 1`,
  };
}
