// What an absent call can say: not "none", but "less than this". For each species called absent,
// the smallest height its principal line could have had and still been found as a peak at the
// noise where it falls: an upper limit, in counts and against the strongest peak seen.
import type { ElementCall } from "../matching/score-elements-types";
import { positionsWithin } from "../matching/lower-bound";
import type { LineIndex } from "../matching/prepare-line-index";
import { walkStrongestFirst } from "../matching/walk-strongest-first";
import type { SourceKind } from "../types";

/** The detection limit of an absent species' principal line. */
export interface DetectionLimit {
  /** The line it is given for: the species' strongest for the source in range. */
  lineNm: number;
  /** Whether that line is the species' principal line (its strongest for the source at all); when
   * not, the principal lies outside the range and this is the strongest line inside it. */
  principal: boolean;
  /** The noise σ of the raw counts there. */
  noiseCounts: number;
  /** The least height, in counts above the continuum, a peak there needs to be found
   * (minSnr × noiseCounts): the line was weaker than this. */
  counts: number;
  /** counts over the height of the tallest peak seen; null when no peak was seen. */
  relativeToStrongest: number | null;
}

export interface DetectionLimitContext {
  index: LineIndex;
  source: SourceKind;
  rangeNm: [number, number];
  /** Noise σ of the raw counts at a wavelength in nm (NaN where the spectrum does not reach). */
  noiseAtNm: (nm: number) => number;
  /** SNR a peak needs to be found. */
  minSnr: number;
  /** Height of the tallest peak seen, in counts; 0 when none. */
  tallestHeight: number;
}

/**
 * For each call with verdict "absent", its detection limit (species without a rated line in range
 * get none). The line is the species' strongest rated line for the source inside the range, the
 * principal one when it is inside (band heads only for a molecule).
 */
export function detectionLimits(
  calls: readonly ElementCall[],
  context: DetectionLimitContext,
): Map<string, DetectionLimit> {
  const { index, source, rangeNm, noiseAtNm, minSnr, tallestHeight } = context;
  const bySpecies = new Map(index.species.map((lines) => [lines.species, lines]));
  const out = new Map<string, DetectionLimit>();
  for (const call of calls) {
    if (call.verdict !== "absent") continue;
    const lines = bySpecies.get(call.species);
    if (!lines) continue;
    const { relative, maxTree } = lines.bySource[source];
    // The atomic lines and the band heads are each sorted by wavelength; each run's strongest rated
    // line in range comes off the range-maximum tree without visiting the others, the earlier
    // position winning a tie (a band head only when strictly stronger).
    let best = -1;
    for (const [first, end] of [
      [0, lines.atomicCount],
      [lines.atomicCount, lines.nm.length],
    ]) {
      const [from, to] = positionsWithin(lines.nm, rangeNm[0], rangeNm[1], first, end);
      walkStrongestFirst(maxTree, from, to, Number.MIN_VALUE, (p) => {
        if (best < 0 || relative[p] > relative[best]) best = p;
        return false;
      });
    }
    if (best < 0) continue;
    const noiseCounts = noiseAtNm(lines.nm[best]);
    if (!(noiseCounts > 0) || !Number.isFinite(noiseCounts)) continue;
    const counts = minSnr * noiseCounts;
    out.set(call.species, {
      lineNm: lines.nm[best],
      principal: relative[best] === 1,
      noiseCounts,
      counts,
      relativeToStrongest: tallestHeight > 0 ? counts / tallestHeight : null,
    });
  }
  return out;
}
