// Whether a rival species could make a share of a peak without its other lines showing.

import { leastRelativeAtLeast } from "./least-relative-at-least";
import type { SinglePeakContext, SpeciesWork } from "./score-elements-stage-types";
import { walkStrongestFirst } from "./walk-strongest-first";

/**
 * Whether `rival`, had its line `lineIndex` stood at SNR `peakSnr` (the share of the peak it is asked
 * to make), would have shown no other line: every line of it in range that would then stand at
 * missingSnr or more is matched to some peak or may hide in a stronger one's wing. A line the table gives no intensity is taken as the rival's
 * faintest rated line in range (the table rates a species' strong lines). A rival without intensities
 * is not weighed and always could.
 */
export function unseenLinesAllow(
  rival: SpeciesWork,
  lineIndex: number,
  peakSnr: number,
  context: SinglePeakContext,
): boolean {
  const { relative, maxTree } = rival.info.scale;
  const { order, nm } = rival.info.lines;
  const ranges = [rival.info.atomicJudged, rival.info.bandsJudged];
  let here = relative[context.index.positionInSpecies[lineIndex]];
  if (Number.isNaN(here)) {
    if (rival.faintestJudged === undefined) {
      let faintest = Infinity;
      for (const [from, to] of ranges) {
        for (let p = from; p < to; p++) if (relative[p] < faintest) faintest = relative[p];
      }
      rival.faintestJudged = faintest;
    }
    here = rival.faintestJudged;
    if (here === Infinity) return true;
  }
  if (!(peakSnr > 0)) return true;
  const scale = peakSnr / here;
  const least = leastRelativeAtLeast(scale, context.missingSnr);
  let allows = true;
  for (const [from, to] of ranges) {
    walkStrongestFirst(maxTree, from, to, least, (p) => {
      if (context.isMatched(order[p])) return true;
      if (context.hiding.hiderOf(nm[p], scale * relative[p]) !== null) return true;
      allows = false;
      return false;
    });
    if (!allows) break;
  }
  return allows;
}
