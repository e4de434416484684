// The wavelength ranges scoreElements judges: where lines are expected, and where they can be missing.

import type { PeakMatch } from "./match-peaks-to-lines";
import type { ScoreElementsOptions } from "./score-elements-types";

/** rangeNm (by default the span of the peaks) and judgedRangeNm (by default rangeNm), each checked. */
export function scoredRangesNm(
  matches: readonly PeakMatch[],
  options: Pick<ScoreElementsOptions, "rangeNm" | "judgedRangeNm">,
): { rangeNm: [number, number]; judgedRangeNm: [number, number] } {
  const rangeNm = options.rangeNm ?? peakSpan(matches);
  const judgedRangeNm = options.judgedRangeNm ?? rangeNm;
  assertRangeNm("rangeNm", rangeNm);
  assertRangeNm("judgedRangeNm", judgedRangeNm);
  return { rangeNm, judgedRangeNm };
}

/** The shortest and longest peak wavelength, nm: the range judged when the caller gives none. */
function peakSpan(matches: readonly PeakMatch[]): [number, number] {
  if (matches.length === 0) return [0, 0];
  let low = Infinity;
  let high = -Infinity;
  for (const match of matches) {
    low = Math.min(low, match.peak.wavelengthNm);
    high = Math.max(high, match.peak.wavelengthNm);
  }
  return [low, high];
}

/** Throws unless `range` is [min, max] of finite numbers with min ≤ max. */
function assertRangeNm(name: string, range: [number, number]): void {
  if (!(range[0] <= range[1]) || !range.every(Number.isFinite)) {
    throw new RangeError(`${name} must be [min, max] with min ≤ max, got [${range.join(", ")}]`);
  }
}
