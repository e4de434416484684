// The line of a species that would tell it from its rivals at a peak.

import type { CalibratedPeak } from "../types";
import type { SpeciesWork } from "./score-elements-stage-types";
import { walkStrongestFirst } from "./walk-strongest-first";

/**
 * The species' strongest line in range (by relative intensity for the source) farther than the
 * peak's FWHM from it: where a peak would tell this species from its rivals. Null when none.
 */
export function decidingLineNm(
  entry: SpeciesWork | undefined,
  peak: CalibratedPeak,
): number | null {
  if (!entry) return null;
  const { maxTree } = entry.info.scale;
  const { nm } = entry.info.lines;
  let found: number | null = null;
  for (const [from, to] of [entry.info.atomicInRange, entry.info.bandsInRange]) {
    walkStrongestFirst(maxTree, from, to, 0, (p) => {
      if (Math.abs(nm[p] - peak.wavelengthNm) <= peak.fwhmNm) return true;
      found = nm[p];
      return false;
    });
    if (found !== null) break;
  }
  return found;
}
