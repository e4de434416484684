// Wavelengths as a call's rationale names them.

/** Wavelengths to two decimals, comma-separated, in nm. */
export function formatNm(values: number[]): string {
  return values.map((v) => v.toFixed(2)).join(", ") + " nm";
}
