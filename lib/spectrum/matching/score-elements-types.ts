// The public shapes of element scoring: its options, the call for each species and its evidence.

import type { CalibratedPeak, ReferenceLine, SourceKind } from "../types";

export type Verdict = "present" | "possible" | "absent";

export interface ScoreElementsOptions {
  /** Kind of source; chooses the expected relative intensities.
   * @default "flame" */
  source?: SourceKind;
  /** Calibrated range of the spectrum [min, max] in nm; only lines inside it are expected.
   * @default the span of the matched peaks' wavelengths */
  rangeNm?: [number, number];
  /** The part of rangeNm where a line would show as a peak; a line closer to the array's ends than
   * that (half of it off the detector) is never counted missing, though it counts when seen.
   * @default rangeNm */
  judgedRangeNm?: [number, number];
  /** Signal-to-noise ratio at which a line is just detectable.
   * @default 3 */
  detectionLimitSnr?: number;
  /** Noise of the spectrum in counts; when given, a peak's SNR is taken as height / noiseCounts
   * instead of the peak's own snr.
   * @default undefined */
  noiseCounts?: number;
  /** A missing line counts against a species when its predicted SNR is at least this many times
   * the detection limit ("well above" it, so noise alone cannot hide it).
   * @default 2 */
  missingSnrFactor?: number;
  /** A line is one of a species' strong lines when its relative intensity is at least this.
   * @default 0.3 */
  strongLineFraction?: number;
  /** Lowest score for "present" (which also needs a strong line seen and none missing).
   * @default 0.5 */
  presentScore?: number;
  /** A missing line within this many FWHM of a peak at least `hidingSnrRatio` times stronger
   * than the line's prediction may be hidden in that peak's wing.
   * @default 1.5 */
  hidingFwhmFactor?: number;
  /** See hidingFwhmFactor.
   * @default 3 */
  hidingSnrRatio?: number;
  /** Lowest score for "possible".
   * @default 0.2 */
  possibleScore?: number;
  /** Weight of a seen line that has no relative intensity on the species' basis.
   * @default 0.1 */
  unratedLineWeight?: number;
  /** Species seen in nearly every run of this source, called present only when intense.
   * @default ["Na I"] for flames, [] otherwise */
  ubiquitousSpecies?: string[];
  /** A ubiquitous species is only a trace when its strongest peak is below this fraction of the
   * tallest peak of the spectrum.
   * @default 0.1 */
  traceFraction?: number;
  /** How many of a call's missing lines that are not hidden are listed, strongest first; the
   * penalty, missingCount and missingStrongCount always take every missing line into account.
   * @default 25 */
  maxMissingListed?: number;
  /** How many of a call's seen lines are listed, strongest first; seenCount, the score, the
   * verdict and the rationale's numbers always take every seen line into account.
   * @default 25 */
  maxSeenListed?: number;
  /** How many seen and missing lines an absent call lists (hidden ones included); its counts stay
   * exact. Against a dense table most species a peak reaches are absent, and their full lists were
   * most of a run's stored size.
   * @default 5 */
  maxListedWhenAbsent?: number;
}

/** A table line seen in the spectrum. */
export interface SeenLineEvidence {
  lineIndex: number;
  line: ReferenceLine;
  peakIndex: number;
  peakWavelengthNm: number;
  referenceNm: number;
  deltaNm: number;
  deltaSigma: number;
  /** Relative intensity on the species' basis, or null when the table has none. */
  relativeIntensity: number | null;
  /** The peak's signal-to-noise ratio. */
  snr: number;
}

/** A line expected in range that no peak matched. */
export interface MissingLineEvidence {
  lineIndex: number;
  line: ReferenceLine;
  referenceNm: number;
  relativeIntensity: number;
  /** SNR the line should have had, scaled from the species' strongest observed line; null when
   * nothing of the species was seen. */
  predictedSnr: number | null;
  /** A much stronger peak close enough to hide the line in its wing; such a line is listed but
   * not counted against the species. */
  hiddenByPeakIndex: number | null;
}

/** Other species whose lines also fall on a peak this species uses. */
export interface OverlapEvidence {
  peakIndex: number;
  peakWavelengthNm: number;
  otherSpecies: string[];
}

/** The call for one species. */
export interface ElementCall {
  species: string;
  element: string;
  ionStage: number | null;
  verdict: Verdict;
  /** 0 … 1: intensity-weighted share of the expected evidence that was seen, each seen line
   * weighted by match closeness and by its share of a peak claimed by several species. */
  score: number;
  /** The `maxSeenListed` strongest seen lines (by relative intensity, unrated ones last, ties in
   * the order below), listed by peak and then in table order; the rest are only counted. */
  seen: SeenLineEvidence[];
  /** Exact number of seen lines (listed or not). */
  seenCount: number;
  /** Exact number of peaks the seen lines stand on: lines blended into one peak are one group and
   * earn one credit, their relative intensities summed (capped at 1). */
  seenPeaks: number;
  /** Missing lines, strongest first (then by wavelength): every one that may be hidden, and the
   * `maxMissingListed` strongest of the others; the rest are only counted. */
  missing: MissingLineEvidence[];
  /** Exact number of missing lines, hidden or not (listed or not). */
  missingCount: number;
  /** Exact number of strong lines (relative intensity ≥ strongLineFraction) missing and not
   * hidden; a present call has none. */
  missingStrongCount: number;
  overlaps: OverlapEvidence[];
  /** Kind of source whose relative intensities were used. */
  intensityBasis: SourceKind | "none";
  notes: string[];
  rationale: string;
}

/** A peak matched by lines of several species that are not absent. */
export interface PeakOverlap {
  peakIndex: number;
  peakWavelengthNm: number;
  species: string[];
}

/** A peak that no credible species explains. */
export interface UnexplainedPeak {
  peakIndex: number;
  peak: CalibratedPeak;
  reason: "no-candidate" | "only-absent-species";
}

export interface ElementScoring {
  /** Sorted by score (highest first), then verdict, then species. */
  calls: ElementCall[];
  overlaps: PeakOverlap[];
  unexplainedPeaks: UnexplainedPeak[];
}
