// Every candidate of every peak in one numbering, with the fields scoring reads of each.

import type { PeakMatch } from "./match-peaks-to-lines";
import type { LineIndex } from "./prepare-line-index";
import type { FlatCandidates } from "./score-elements-stage-types";

/**
 * Every candidate of `matches` numbered in one sequence, peak after peak in the columns' order, with
 * the fields every candidate is read for. Throws when a peak was matched against another table than
 * `index`: one line of each peak tells (a check of every candidate would read the table's rows at
 * random, one cache miss per line).
 */
export function flattenCandidates(matches: readonly PeakMatch[], index: LineIndex): FlatCandidates {
  const count = matches.reduce((n, match) => n + match.columns.count, 0);
  const candidates: FlatCandidates = {
    matchOf: new Uint32Array(count),
    at: new Uint32Array(count),
    lineIndex: new Uint32Array(count),
    absSigma: new Float64Array(count),
    columns: matches.map((match) => match.columns),
  };
  let flat = 0;
  for (let m = 0; m < matches.length; m++) {
    const columns = matches[m].columns;
    const first = columns.lineIndex[0];
    if (columns.count > 0 && index.lines[first] !== columns.lines[first]) {
      throw new RangeError(
        `peak ${matches[m].peakIndex} was matched against a different line table than the one scored`,
      );
    }
    candidates.lineIndex.set(columns.lineIndex, flat);
    for (let c = 0; c < columns.count; c++, flat++) {
      candidates.matchOf[flat] = m;
      candidates.at[flat] = c;
      candidates.absSigma[flat] = Math.abs(columns.deltaSigma[c]);
    }
  }
  return candidates;
}
