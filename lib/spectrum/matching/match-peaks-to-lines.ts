// Finds, for each calibrated peak, the reference lines and band heads within k·σ of its wavelength;
// a peak flagged broad (too wide for one atomic line) is offered band heads only.

import type { CalibratedPeak, ReferenceLine, WavelengthMedium } from "../types";
import {
  candidatesFromColumns,
  finishCandidates,
  pushCandidate,
  startCandidates,
  type CandidateColumns,
  type LineCandidate,
} from "./candidate-columns";
import { depthIntoBandNm } from "./depth-into-band";
import { leansLikeBand } from "./leans-like-band";
import { lowerBound } from "./lower-bound";
import { assertPositiveFinite } from "../units/assert-positive-finite";
import { assertFraction } from "../units/assert-fraction";
import { assertNonNegativeFinite } from "../units/assert-non-negative-finite";
import { prepareLineIndex, type LineIndex } from "./prepare-line-index";

export interface MatchPeaksToLinesOptions {
  /** Half-width of the acceptance window in combined standard deviations.
   * @default 3 */
  k?: number;
  /** Instrument resolution (FWHM of an unresolved line) in nm, for peaks that carry no
   * resolutionNm of their own (a peak's own value, set where the resolution varies across the
   * array as on a prism, takes precedence).
   * @default each peak's own fwhmNm */
  resolutionNm?: number;
  /** σ_res = resolutionSigmaFraction × resolution FWHM; 1/√12 is the standard deviation of a
   * shift spread evenly over ±FWHM/2, the most an unresolved blend can move a centroid.
   * @default 1 / Math.sqrt(12) */
  resolutionSigmaFraction?: number;
  /** For a peak not flagged blended, with the instrument's FWHM known: σ_res = max(this × the
   * instrument FWHM, resolutionSigmaFraction × min(FWHM_peak, 2·√(FWHM_peak² −
   * FWHM_instrument²))): an unresolved companion lies within the peak's width beyond the
   * instrument's on either side, and within the peak. A companion close
   * enough to stay unresolved and not widen the peak beyond the noise on its measured width moves
   * the centroid by a tenth of the FWHM or so (two equal lines a third of a FWHM apart widen the
   * peak by about 4 % and sit a sixth of a FWHM from the centroid).
   * @default 0.1 */
  cleanResolutionSigmaFraction?: number;
  /** Axis the peaks are calibrated on; must agree with a prepared index's medium.
   * @default the index's medium, or "air" */
  medium?: WavelengthMedium;
  /** Share of a band's extent, measured from its head, inside which a peak counts as the head.
   * @default 0.3 */
  bandHeadZoneFraction?: number;
}

export type { LineCandidate } from "./candidate-columns";

/** The candidates of one peak. */
export interface PeakMatch {
  /** Position of the peak in the input array. */
  peakIndex: number;
  peak: CalibratedPeak;
  /** The candidates as objects, closest (smallest |deltaSigma|) first; built from `columns` when
   * first read. */
  readonly candidates: LineCandidate[];
  /** The same candidates as columns, in the order the search met them: what reads them all. */
  columns: CandidateColumns;
}

/** A band at least this many instrument FWHM long is resolved (common practice, no source)… */
const RESOLVED_BAND_WIDTHS = 4;
/** …and a peak narrower than this many instrument FWHM is a line, not that band. */
const RESOLVED_BAND_MIN_FWHM = 1.5;

/** Guards against a zero tolerance when every contribution happens to be zero. */
const MINIMUM_SIGMA_NM = 1e-6;

/**
 * σ² = σ_peak² + σ_line² + σ_res²: σ_peak is the peak's wavelengthUncertaintyNm (its centre
 * uncertainty through the dispersion, with the calibration's uncertainty there), σ_line the
 * table's, σ_res the resolution term: resolutionSigmaFraction × the instrument's FWHM at the peak
 * (the peak's resolutionNm, else options.resolutionNm; the peak's own FWHM when it is blended and
 * wider, or when neither is known), and for a peak not flagged blended only what its width beyond
 * the instrument's allows (see cleanResolutionSigmaFraction). A peak flagged broad gets band candidates only. Lines are found by binary search on the prepared index
 * within the widest possible window, then each pair is tested with its own σ: O(P log L + hits).
 */
export function matchPeaksToLines(
  peaks: readonly CalibratedPeak[],
  lines: readonly ReferenceLine[] | LineIndex,
  options: MatchPeaksToLinesOptions = {},
): PeakMatch[] {
  const {
    k = 3,
    resolutionNm,
    resolutionSigmaFraction = 1 / Math.sqrt(12),
    cleanResolutionSigmaFraction = 0.1,
    medium,
    bandHeadZoneFraction = 0.3,
  } = options;
  assertPositiveFinite(k, "k");
  if (resolutionNm !== undefined) assertPositiveFinite(resolutionNm, "resolutionNm");
  assertNonNegativeFinite(resolutionSigmaFraction, "resolutionSigmaFraction");
  assertNonNegativeFinite(cleanResolutionSigmaFraction, "cleanResolutionSigmaFraction");
  assertFraction(bandHeadZoneFraction, "bandHeadZoneFraction");
  const index = isLineIndex(lines) ? lines : prepareLineIndex(lines, { medium: medium ?? "air" });
  if (medium !== undefined && medium !== index.medium) {
    throw new RangeError(`medium "${medium}" disagrees with the line index's "${index.medium}"`);
  }

  const found = startCandidates();
  const ends: number[] = [];
  peaks.forEach((peak, peakIndex) => {
    assertPeak(peak, peakIndex);
    const instrumentNm = peak.resolutionNm ?? resolutionNm;
    // The instrument's FWHM at the peak, or a blended peak's own when wider (its components can lie
    // anywhere across it); a band's feature is as wide as the band by nature, so its head's place is
    // compared to within this alone, the head zone allowing for the extent.
    const resolutionFwhmNm =
      instrumentNm === undefined
        ? peak.fwhmNm
        : peak.blended
          ? Math.max(instrumentNm, peak.fwhmNm)
          : instrumentNm;
    const bandSigmaResNm = resolutionSigmaFraction * resolutionFwhmNm;
    // A clean peak no wider than one line cannot hide a companion that would move its centroid far:
    // only its width beyond the instrument's (in quadrature) can, with a floor for what noise on the
    // measured width leaves unseen.
    const sigmaResNm =
      instrumentNm === undefined || peak.blended
        ? bandSigmaResNm
        : Math.max(
            cleanResolutionSigmaFraction * instrumentNm,
            resolutionSigmaFraction *
              Math.min(
                peak.fwhmNm,
                2 * Math.sqrt(Math.max(0, peak.fwhmNm ** 2 - instrumentNm ** 2)),
              ),
          );
    const baseVarianceNm2 = peak.wavelengthUncertaintyNm ** 2 + sigmaResNm ** 2;
    const bandVarianceNm2 = peak.wavelengthUncertaintyNm ** 2 + bandSigmaResNm ** 2;

    const lineReachNm = k * Math.sqrt(baseVarianceNm2 + index.maxLineUncertaintyNm ** 2);
    // Several instrument widths wide is a band, a blend of many lines or continuum structure:
    // no single atomic line explains it, and its wide window would catch lines by chance.
    const from = peak.broad
      ? index.lineWavelengthNm.length
      : lowerBound(index.lineWavelengthNm, peak.wavelengthNm - lineReachNm);
    const { lineWavelengthNm, lineUncertaintyNm, lineOrder } = index;
    for (let i = from; i < lineWavelengthNm.length; i++) {
      const referenceNm = lineWavelengthNm[i];
      if (referenceNm > peak.wavelengthNm + lineReachNm) break;
      const sigmaNm = Math.max(
        MINIMUM_SIGMA_NM,
        Math.sqrt(baseVarianceNm2 + lineUncertaintyNm[i] ** 2),
      );
      const deltaNm = peak.wavelengthNm - referenceNm;
      const deltaSigma = deltaNm / sigmaNm;
      if (Math.abs(deltaSigma) <= k) {
        pushCandidate(found, lineOrder[i], false, referenceNm, deltaNm, sigmaNm, deltaSigma);
      }
    }

    if (index.bandHeadNm.length > 0) {
      const bandReachNm =
        index.maxBandExtentNm + k * Math.sqrt(bandVarianceNm2 + index.maxBandUncertaintyNm ** 2);
      const fromBand = lowerBound(index.bandHeadNm, peak.wavelengthNm - bandReachNm);
      for (let i = fromBand; i < index.bandHeadNm.length; i++) {
        const referenceNm = index.bandHeadNm[i];
        if (referenceNm > peak.wavelengthNm + bandReachNm) break;
        const lineIndex = index.bandOrder[i];
        const line = index.lines[lineIndex];
        const band = line.band!;
        const sigmaNm = Math.max(
          MINIMUM_SIGMA_NM,
          Math.sqrt(bandVarianceNm2 + line.uncertaintyNm ** 2),
        );
        const deltaNm = peak.wavelengthNm - referenceNm;
        const depthNm = depthIntoBandNm(band, referenceNm, peak.wavelengthNm);
        const zoneNm = bandHeadZoneFraction * band.extentNm;
        const outsideNm = depthNm < 0 ? depthNm : Math.max(0, depthNm - zoneNm);
        const deltaSigma = outsideNm / sigmaNm;
        // A band's feature spans at most its extent, blurred by the instrument at either end (and
        // merged with a neighbouring head's): a peak wider than that is continuum or many lines.
        const widestNm = band.extentNm + 2 * (instrumentNm ?? 0);
        // A band several instrument widths long is resolved: its feature is wider than a line's.
        const resolved =
          instrumentNm !== undefined && band.extentNm >= RESOLVED_BAND_WIDTHS * instrumentNm;
        const narrowestNm = resolved ? RESOLVED_BAND_MIN_FWHM * instrumentNm : 0;
        if (
          Math.abs(deltaSigma) <= k &&
          peak.fwhmNm <= widestNm &&
          peak.fwhmNm >= narrowestNm &&
          // A resolved band's peak leans away from its head.
          (!resolved || leansLikeBand(peak, band, instrumentNm))
        ) {
          pushCandidate(found, lineIndex, true, referenceNm, deltaNm, sigmaNm, deltaSigma);
        }
      }
    }

    ends.push(found.count);
  });
  return finishCandidates(found, index.lines, ends).map((columns, peakIndex) => {
    let candidates: LineCandidate[] | undefined;
    return {
      peakIndex,
      peak: peaks[peakIndex],
      get candidates() {
        return (candidates ??= candidatesFromColumns(columns));
      },
      columns,
    };
  });
}

function isLineIndex(lines: readonly ReferenceLine[] | LineIndex): lines is LineIndex {
  return !Array.isArray(lines);
}

function assertPeak(peak: CalibratedPeak, position: number): void {
  if (!(peak.wavelengthNm > 0) || !Number.isFinite(peak.wavelengthNm)) {
    throw new RangeError(`peak ${position} has an invalid wavelengthNm: ${peak.wavelengthNm}`);
  }
  if (!(peak.wavelengthUncertaintyNm >= 0) || !Number.isFinite(peak.wavelengthUncertaintyNm)) {
    throw new RangeError(
      `peak ${position} has an invalid wavelengthUncertaintyNm: ${peak.wavelengthUncertaintyNm}`,
    );
  }
  if (!(peak.fwhmNm >= 0) || !Number.isFinite(peak.fwhmNm)) {
    throw new RangeError(`peak ${position} has an invalid fwhmNm: ${peak.fwhmNm}`);
  }
  if (
    peak.resolutionNm !== undefined &&
    (!(peak.resolutionNm > 0) || !Number.isFinite(peak.resolutionNm))
  ) {
    throw new RangeError(`peak ${position} has an invalid resolutionNm: ${peak.resolutionNm}`);
  }
}
