// Candidate peak tops: downward zero-crossings of the slope or the signal's own local maxima, above a
// height floor, separated by real dips.

export interface FindCandidateMaximaOptions {
  /**
   * Smallest accepted top, in signal units (the caller passes minSnr × noise); an array gives the
   * floor at each sample (minSnr × the local noise), read at the top.
   * @default 0
   */
  minHeight?: number | Float64Array;
  /**
   * Two tops count as separate only if the signal between them falls this far below the lower top;
   * otherwise the lower one is merged into the higher (noise wiggles on one line are not two lines).
   * An array gives it per sample, read at the lower top.
   * @default 0
   */
  minDip?: number | Float64Array;
}

export interface CandidateMaxima {
  /** Sample indices of the tops, increasing, never the first or last sample. */
  tops: number[];
  /** valleys[j] is the index of the lowest sample between tops[j] and tops[j + 1]. */
  valleys: number[];
}

/**
 * Finds tops of `signal` where `slope` (its smoothed derivative) changes from positive to
 * non-positive or where `signal` itself has a local maximum, moves each onto the local maximum of
 * `signal`, and merges tops not separated by a dip of `minDip`. One left-to-right pass: O(n).
 */
export function findCandidateMaxima(
  data: { signal: Float64Array; slope: Float64Array },
  options: FindCandidateMaximaOptions = {},
): CandidateMaxima {
  const { signal, slope } = data;
  const { minHeight = 0, minDip = 0 } = options;
  const n = signal.length;
  if (slope.length !== n)
    throw new RangeError(`slope and signal differ in length (${slope.length} vs ${n})`);
  for (const [name, value] of Object.entries({ minHeight, minDip })) {
    if (typeof value !== "number" && value.length !== n) {
      throw new RangeError(`${name} and signal differ in length (${value.length} vs ${n})`);
    }
  }
  const heightAt = (i: number) => (typeof minHeight === "number" ? minHeight : minHeight[i]);
  const dipAt = (i: number) => (typeof minDip === "number" ? minDip : minDip[i]);
  const tops: number[] = [];
  const valleys: number[] = [];
  let last = -1;
  let lowest = -1;
  let scanFrom = 0;
  let previousRaw = -1;
  for (let i = 1; i < n; i++) {
    // A downward zero-crossing of the slope, or a top of the signal itself: a fainter line 1.3 FWHM
    // beside a strong one, sampled 2.5 times per FWHM, is a one-sample top on the strong line's
    // falling flank whose central differences never turn positive (Na D1 beside D2 at 0.44 nm).
    const slopeTurns = slope[i - 1] > 0 && slope[i] <= 0;
    const ownTop = i < n - 1 && signal[i] > signal[i - 1] && signal[i] >= signal[i + 1];
    if (!slopeTurns && !ownTop) continue;
    let top = signal[i] >= signal[i - 1] ? i : i - 1;
    // The slope is smoother than the signal; climb to the signal's own local maximum.
    while (top > 1 && signal[top - 1] > signal[top]) top--;
    while (top < n - 2 && signal[top + 1] > signal[top]) top++;
    if (top < 1 || top > n - 2 || top === previousRaw || signal[top] < heightAt(top)) continue;
    previousRaw = top;
    if (last < 0 || top <= last) {
      if (last < 0) {
        last = top;
        scanFrom = top + 1;
      }
      continue;
    }
    for (let j = scanFrom; j < top; j++) if (lowest < 0 || signal[j] < signal[lowest]) lowest = j;
    scanFrom = top + 1;
    if (lowest < 0) lowest = last;
    const lowerTop = signal[last] <= signal[top] ? last : top;
    if (signal[lowerTop] - signal[lowest] >= dipAt(lowerTop) && lowest !== last) {
      tops.push(last);
      valleys.push(lowest);
      last = top;
      lowest = -1;
    } else if (signal[top] > signal[last]) {
      last = top;
      lowest = -1;
    }
  }
  if (last >= 0) tops.push(last);
  return { tops, valleys };
}
