// Numbers for exports at the precision their uncertainty supports: the uncertainty to two significant
// digits and the value to the same decimal place (JCGM 100:2008, the GUM, 7.2.6, from memory), instead of
// the 15–17 digits a double prints.

/** Decimal places that give `uncertainty` `digits` significant digits (negative: round to tens, …). */
export function decimalsForUncertainty(uncertainty: number, digits = 2): number | null {
  if (!(uncertainty > 0) || !Number.isFinite(uncertainty)) return null;
  return digits - 1 - Math.floor(Math.log10(uncertainty));
}

/** `value` rounded to `decimals` places (negative rounds to tens, hundreds, …); -0 becomes 0. */
export function roundToDecimals(value: number, decimals: number): number {
  if (!Number.isFinite(value)) return value;
  const rounded =
    decimals >= 0
      ? Number(value.toFixed(Math.min(decimals, 20)))
      : Math.round(value / 10 ** -decimals) * 10 ** -decimals;
  return rounded === 0 ? 0 : rounded;
}

/**
 * `value` rounded to the decimal place of `uncertainty` at two significant digits; a value without
 * a usable uncertainty keeps `fallbackDigits` significant digits.
 */
export function roundToUncertainty(value: number, uncertainty: number, fallbackDigits = 6): number {
  const decimals = decimalsForUncertainty(uncertainty);
  return decimals === null
    ? roundSignificant(value, fallbackDigits)
    : roundToDecimals(value, decimals);
}

/** `value` to `digits` significant digits. */
export function roundSignificant(value: number, digits: number): number {
  if (!Number.isFinite(value) || value === 0) return value === 0 ? 0 : value;
  return Number(value.toPrecision(digits));
}
