// A Savitzky–Golay filter rings beside a line narrower than its window: small false tops a few
// samples from a strong narrow line, a few parts in a thousand of its height (a 9-sample quartic
// filter on a line 3 samples wide puts tops of 0.4 % at ±6 samples). They are no lines.

/**
 * Drops every top lower than `fraction` of a neighbouring top within `reach` samples (tops and
 * valleys as findCandidateMaxima gives them; the valley between the remaining neighbours becomes
 * the lower of the two around the dropped top). Returns new arrays; O(tops).
 */
export function dropSmoothingRinging(
  candidates: { tops: number[]; valleys: number[] },
  signal: Float64Array,
  options: { reach: number; fraction: number },
): { tops: number[]; valleys: number[] } {
  const { reach, fraction } = options;
  const { tops, valleys } = candidates;
  const ringing = (p: number) => {
    const k = tops[p];
    for (const q of [p - 1, p + 1]) {
      if (q < 0 || q >= tops.length || Math.abs(tops[q] - k) > reach) continue;
      if (signal[k] < fraction * signal[tops[q]]) return true;
    }
    return false;
  };
  const keptTops: number[] = [];
  const keptValleys: number[] = [];
  // The lowest valley since the last kept top, carried across dropped tops.
  let pending = -1;
  for (let p = 0; p < tops.length; p++) {
    const before = p > 0 ? valleys[p - 1] : -1;
    if (before >= 0 && (pending < 0 || signal[before] < signal[pending])) pending = before;
    if (ringing(p)) continue;
    if (keptTops.length > 0) keptValleys.push(pending);
    keptTops.push(tops[p]);
    pending = -1;
  }
  return { tops: keptTops, valleys: keptValleys };
}
