// Bands called present whose fading tail lies under a peak.

import type { CalibratedPeak } from "../types";
import { depthIntoBandNm } from "./depth-into-band";
import { EXPLAINING_SHARE } from "./explaining-share";
import { positionsWithin } from "./lower-bound";
import type { LineIndex } from "./prepare-line-index";
import type { ElementCall } from "./score-elements-types";

/** Species of bands called present whose extent, from the head in the direction the band degrades,
 * covers the peak, and which are bright enough to make EXPLAINING_SHARE of it: a band's tail is never
 * brighter than its head, so a band whose brightest seen peak is fainter than that cannot (Tl I
 * 535.05 nm standing 20 times above the BaCl heads it lies beyond). A band of `element`'s own molecule
 * (CaOH for Ca: its formula's first element symbol) stands with it, not against it. */
export function seenBandsCovering(
  peak: CalibratedPeak,
  element: string,
  callOf: Map<string, ElementCall>,
  index: LineIndex,
): string[] {
  const nm = peak.wavelengthNm;
  const out: string[] = [];
  const [first, end] = positionsWithin(
    index.bandHeadNm,
    nm - index.maxBandExtentNm,
    nm + index.maxBandExtentNm,
  );
  for (let i = first; i < end; i++) {
    const line = index.lines[index.bandOrder[i]];
    const band = line.band!;
    const depthNm = depthIntoBandNm(band, index.bandHeadNm[i], nm);
    const bandCall = callOf.get(line.species);
    if (
      depthNm >= 0 &&
      depthNm <= band.extentNm &&
      firstElementOf(line.element) !== element &&
      bandCall?.verdict === "present" &&
      !out.includes(line.species) &&
      bandCall.seen.some((seen) => seen.snr >= EXPLAINING_SHARE * peak.snr)
    ) {
      out.push(line.species);
    }
  }
  return out;
}

/** The element symbol a formula opens with: "Ca" of "CaOH", "B" of "BO2". */
function firstElementOf(formula: string): string | undefined {
  return /^[A-Z][a-z]?/.exec(formula)?.[0];
}
