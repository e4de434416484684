// Whether a species seen elsewhere is bright enough to have made a given peak.

import { EXPLAINING_SHARE } from "./explaining-share";
import type { ElementCall } from "./score-elements-types";

/**
 * Whether `rival`'s line at `peakIndex` could have made that peak: judged from the rival's strongest
 * line seen at another peak, scaled by the two lines' relative intensities (a faint line of a species
 * seen strongly elsewhere cannot make a strong peak). A line the table gives no intensity is taken as
 * no stronger than the rival's faintest rated line seen (the table rates a species' strong lines).
 * Null without a rated line seen elsewhere: nothing there to judge from.
 */
export function couldMake(
  rival: ElementCall,
  peakIndex: number,
  relativeHere: number,
  peakSnr: number,
): boolean | null {
  const elsewhere = rival.seen.filter(
    (s) => s.peakIndex !== peakIndex && s.relativeIntensity !== null && s.relativeIntensity > 0,
  );
  if (elsewhere.length === 0) return null;
  if (!(peakSnr > 0)) return true;
  const anchor = elsewhere.reduce((a, b) => (b.relativeIntensity! > a.relativeIntensity! ? b : a));
  const relative = Number.isNaN(relativeHere)
    ? Math.min(...elsewhere.map((s) => s.relativeIntensity!))
    : relativeHere;
  const expectedSnr = (anchor.snr * relative) / anchor.relativeIntensity!;
  return expectedSnr >= EXPLAINING_SHARE * peakSnr;
}
