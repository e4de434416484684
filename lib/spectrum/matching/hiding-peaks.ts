// The peaks that may hide a missing line in their wing, searched by wavelength.

import type { CalibratedPeak } from "../types";
import { positionsWithin } from "./lower-bound";
import type { PeakMatch } from "./match-peaks-to-lines";
import type { HidingPeaks } from "./score-elements-stage-types";
import { dipIsShallow } from "./two-line-dip";

/**
 * A dip between two lines must be this many noise σ deep for the peak finder to keep them apart: its
 * test is 3 σ on the smoothed signal, and smoothing and sampling at 2–3 samples per FWHM take about half
 * of a dip away (Na D1 beside D2 at 0.46 nm resolution went unseen at SNR 40 with a 4 σ dip).
 */
const RESOLVING_DIP_SNR = 6;

/**
 * For a missing line at `nm` with its predicted SNR, the strongest peak within hidingFwhmFactor of
 * its own FWHM that outshines the prediction by hidingSnrRatio, if any. Peaks are searched by
 * wavelength within the widest reach of any peak, so each look-up costs log P plus the peaks near.
 */
export function hidingPeaks(
  matches: readonly PeakMatch[],
  snrOf: (peak: CalibratedPeak) => number,
  fwhmFactor: number,
  snrRatio: number,
): HidingPeaks {
  const byWavelength = [...matches].sort((a, b) => a.peak.wavelengthNm - b.peak.wavelengthNm);
  const wavelengthNm = Float64Array.from(byWavelength, (match) => match.peak.wavelengthNm);
  const reachNm = Float64Array.from(byWavelength, (match) => fwhmFactor * match.peak.fwhmNm);
  const snr = Float64Array.from(byWavelength, (match) => snrOf(match.peak));
  const instrumentNm = Float64Array.from(
    byWavelength,
    (match) => match.peak.resolutionNm ?? match.peak.fwhmNm,
  );
  // How many samples an instrument FWHM spans at each peak (NaN when the peak does not say).
  const instrumentSamples = Float64Array.from(byWavelength, (match, i) =>
    match.peak.fwhmSamples !== undefined && match.peak.fwhmNm > 0
      ? (instrumentNm[i] * match.peak.fwhmSamples) / match.peak.fwhmNm
      : Number.NaN,
  );
  const maxReachNm = reachNm.reduce((r, reach) => Math.max(r, reach), 0);
  // Slack so that rounding in nm ± reach cannot drop a peak the exact test below would accept.
  const slackNm = 1e-9 * (maxReachNm + 1);
  const hiderOf = (nm: number, predictedSnr: number) => {
    let best: PeakMatch | null = null;
    let bestSnr = -Infinity;
    const [first, end] = positionsWithin(
      wavelengthNm,
      nm - maxReachNm - slackNm,
      nm + maxReachNm + slackNm,
    );
    for (let i = first; i < end; i++) {
      if (Math.abs(wavelengthNm[i] - nm) > reachNm[i]) continue;
      // Far fainter than the peak, or a companion so close that the dip between them would not clear
      // the peak finder's test: in either case no peak of its own could show.
      // (The dip is worked out only for a line the peak does not outshine.)
      const hides =
        snr[i] >= snrRatio * predictedSnr ||
        (predictedSnr <= snr[i] &&
          dipIsShallow(
            Math.abs(wavelengthNm[i] - nm) / instrumentNm[i],
            predictedSnr / snr[i],
            Number.isNaN(instrumentSamples[i]) ? undefined : instrumentSamples[i],
            snr[i],
            RESOLVING_DIP_SNR,
          ));
      if (!hides) continue;
      if (!best || snr[i] > bestSnr) {
        best = byWavelength[i];
        bestSnr = snr[i];
      }
    }
    return best ? best.peakIndex : null;
  };
  return { wavelengthNm, reachNm, snr, hiderOf };
}
