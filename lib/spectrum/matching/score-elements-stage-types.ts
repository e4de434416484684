// The working shapes scoreElements' stages hand each other; not part of the public API.

import type { CalibratedPeak, ReferenceLine, SourceKind } from "../types";
import type { CandidateColumns } from "./candidate-columns";
import type { PeakMatch } from "./match-peaks-to-lines";
import type { LineIndex, SpeciesBasis, SpeciesLines } from "./prepare-line-index";
import type { ScoreElementsOptions, SeenLineEvidence } from "./score-elements-types";

/** scoreElements' options with their defaults in place (the ranges are resolved by scoredRangesNm). */
export type ScoreSettings = Required<
  Omit<ScoreElementsOptions, "rangeNm" | "judgedRangeNm" | "noiseCounts">
> &
  Pick<ScoreElementsOptions, "noiseCounts">;

/** Every candidate of every peak in one numbering (see flattenCandidates). */
export interface FlatCandidates {
  /** Each candidate's peak (its position in the matches) and its position in that peak's columns. */
  matchOf: Uint32Array;
  at: Uint32Array;
  lineIndex: Uint32Array;
  /** |Δλ/σ|. */
  absSigma: Float64Array;
  /** The columns of each peak, by position in the matches. */
  columns: CandidateColumns[];
}

/** One species' lines seen at one peak: one piece of evidence, credited once. */
export interface SeenGroup {
  peakIndex: number;
  peak: CalibratedPeak;
  /** Its lines' candidates (numbers in FlatCandidates), in table order. */
  members: number[];
  weight: number;
  ratedWeight: number;
  quality: number;
  snr: number;
}

/** One species' lines and the scale used for the chosen source. */
export interface SpeciesInfo {
  lines: SpeciesLines;
  scale: SpeciesBasis;
  basis: SourceKind | "none";
  /** Positions [from, to) in lines.order of its atomic lines in range, then of its band heads. */
  atomicInRange: [number, number];
  bandsInRange: [number, number];
  /** The same inside the judged range (judgedRangeNm): the lines that can be missing. */
  atomicJudged: [number, number];
  bandsJudged: [number, number];
}

export interface SpeciesWork {
  info: SpeciesInfo;
  groups: SeenGroup[];
  /** Lines in range whose relative intensity is at least strongLineFraction. */
  strongInRange: number;
  /** Positions (in info.lines) of the hidden missing lines and of the strongest others, strongest
   * first; see ElementCall.missing. Evidence is built only for those a call lists. */
  missing: number[];
  /** The peak that may hide each hidden missing line, by position. */
  hiddenBy: Map<number, number>;
  /** SNR per unit of relative intensity, from the anchor; null without one. */
  snrPerRelative: number | null;
  missingCount: number;
  missingStrongCount: number;
  missingWeight: number;
  /** Relative intensity of the strongest missing line that is not hidden; 0 when there is none. */
  strongestMissingRelative: number;
  anchor: SeenGroup | null;
  score: number;
  /** Peaks of which the species could have made a fair share (EXPLAINING_SHARE or more). */
  heldPeaks: number[];
  /** Its faintest rated line in the judged range (Infinity: none), once unseenLinesAllow needs it. */
  faintestJudged?: number;
}

/** Each table line credited to the one peak it matches best (see assignLinesToPeaks). */
export interface LineAssignment {
  candidates: FlatCandidates;
  /** The winning candidate of each matched line, by line index; read only where isMatched. */
  bestCandidateOfLine: Uint32Array;
  isMatched: (lineIndex: number) => boolean;
}

/** The seen groups of a call (see groupSeenLines). */
export interface SeenGroups {
  /** Each peak's groups by species, in the order of their first line. */
  groupsByPeak: Map<number, Map<string, SeenGroup>>;
  /** Species of each peak's candidates, sorted, by peak index. */
  speciesAtPeak: Map<number, string[]>;
  /** Each species' groups by its position in the index, species in the order their first group was
   * made, groups in the order of the matches. */
  groupsOfSpecies: Map<number, SeenGroup[]>;
}

/** The peaks by wavelength with their hiding reach and SNR, and the hiding test itself. */
export interface HidingPeaks {
  wavelengthNm: Float64Array;
  reachNm: Float64Array;
  snr: Float64Array;
  /** For a missing line at `nm` with its predicted SNR, the strongest peak that may hide it. */
  hiderOf: (nm: number, predictedSnr: number) => number | null;
}

/** A species' seen lines: exact counts, and the evidence of the strongest ones. */
export interface SeenTally {
  count: number;
  /** Seen lines whose relative intensity is at least strongLineFraction. */
  strongCount: number;
  /** Largest |Δλ/σ| of any seen line. */
  worstSigma: number;
  listed: SeenLineEvidence[];
}

/** What buildCall reads besides the species' own work. */
export interface CallContext {
  strongLineFraction: number;
  presentScore: number;
  possibleScore: number;
  ubiquitous: boolean;
  source: SourceKind;
  traceFraction: number;
  tallestHeight: number;
  matchByPeak: Map<number, PeakMatch>;
  /** Species of each peak's candidates, sorted, by peak index. */
  speciesAtPeak: Map<number, string[]>;
  positionInSpecies: Uint32Array;
  maxSeenListed: number;
  maxListedWhenAbsent: number;
  candidates: FlatCandidates;
  /** The scored table's lines. */
  lines: readonly ReferenceLine[];
}

/** What demoteSinglePeakCalls and unseenLinesAllow read besides the calls. */
export interface SinglePeakContext {
  matchByPeak: Map<number, PeakMatch>;
  work: Map<string, SpeciesWork>;
  index: LineIndex;
  isMatched: (lineIndex: number) => boolean;
  hiding: HidingPeaks;
  missingSnr: number;
  source: SourceKind;
}
