// Credits each table line to the one peak it matches best, so that no line is seen twice.

import { flattenCandidates } from "./flatten-candidates";
import type { PeakMatch } from "./match-peaks-to-lines";
import type { LineIndex } from "./prepare-line-index";
import type { LineAssignment } from "./score-elements-stage-types";

/**
 * Each line's best candidate: the closest in σ, ties to the lower peak index. The winner of each line
 * is kept in scratch arrays over the table, valid for this call's generation only.
 */
export function assignLinesToPeaks(
  matches: readonly PeakMatch[],
  index: LineIndex,
): LineAssignment {
  const candidates = flattenCandidates(matches, index);
  const { owner: bestCandidateOfLine, stamp, generation } = nextScratch(index);
  const isMatched = (lineIndex: number) => stamp[lineIndex] === generation;
  for (let flat = 0; flat < candidates.lineIndex.length; flat++) {
    const lineIndex = candidates.lineIndex[flat];
    if (stamp[lineIndex] !== generation) {
      stamp[lineIndex] = generation;
      bestCandidateOfLine[lineIndex] = flat;
      continue;
    }
    const heldFlat = bestCandidateOfLine[lineIndex];
    const heldSigma = candidates.absSigma[heldFlat];
    const sigma = candidates.absSigma[flat];
    if (
      sigma < heldSigma ||
      (sigma === heldSigma &&
        matches[candidates.matchOf[flat]].peakIndex <
          matches[candidates.matchOf[heldFlat]].peakIndex)
    ) {
      bestCandidateOfLine[lineIndex] = flat;
    }
  }
  return { candidates, bestCandidateOfLine, isMatched };
}

/** Per line of a table: the winning candidate, and the call (generation) that wrote it. */
interface Scratch {
  owner: Uint32Array;
  stamp: Uint32Array;
  generation: number;
}

const scratchByIndex = new WeakMap<LineIndex, Scratch>();

/** The index's scratch arrays for a new call: entries written by earlier calls are stale. */
function nextScratch(index: LineIndex): Scratch {
  let scratch = scratchByIndex.get(index);
  if (!scratch || scratch.generation >= 0xffffffff) {
    const n = index.lines.length;
    scratch = { owner: new Uint32Array(n), stamp: new Uint32Array(n), generation: 0 };
    scratchByIndex.set(index, scratch);
  }
  scratch.generation++;
  return scratch;
}
