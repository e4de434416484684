// The small words of a call's rationale: wavelengths as it names them, plural endings, and the tail
// of a capped list. One module because every sentence-building stage needs all three.

/** Wavelengths to two decimals, comma-separated, in nm. */
export function formatNm(values: number[]): string {
  return values.map((v) => v.toFixed(2)).join(", ") + " nm";
}

/** "s" unless the count is one. */
export function plural(count: number): string {
  return count === 1 ? "" : "s";
}

/** ", and N more" for what a capped list leaves out, nothing when it left nothing out. */
export function andMore(count: number): string {
  return count > 0 ? `, and ${count} more` : "";
}
