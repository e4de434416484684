// Public API of line matching and element calls.
export { identifyElements } from "./identify-elements";
export type { ElementIdentification, IdentifyElementsOptions } from "./identify-elements";
export { matchPeaksToLines } from "./match-peaks-to-lines";
export type { LineCandidate, MatchPeaksToLinesOptions, PeakMatch } from "./match-peaks-to-lines";
export { prepareLineIndex } from "./prepare-line-index";
export type { LineIndex, PrepareLineIndexOptions } from "./prepare-line-index";
export { scoreElements } from "./score-elements";
export type {
  ElementCall,
  ElementScoring,
  MissingLineEvidence,
  OverlapEvidence,
  PeakOverlap,
  ScoreElementsOptions,
  SeenLineEvidence,
  UnexplainedPeak,
  Verdict,
} from "./score-elements-types";
export {
  INTENSITY_FALLBACK_ORDER,
  speciesRelativeIntensities,
} from "./species-relative-intensities";
export type { SpeciesIntensities } from "./species-relative-intensities";
export { wavelengthForMatchingNm } from "./wavelength-for-matching-nm";
