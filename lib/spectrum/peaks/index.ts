// Public API of peak finding.
export { findPeaks, type FindPeaksOptions } from "./find-peaks";
export { pickPeaks, type PickPeaksOptions } from "./pick-peaks";
export {
  findCandidateMaxima,
  type FindCandidateMaximaOptions,
  type CandidateMaxima,
} from "./find-candidate-maxima";
export { fitPeakTop, type FitPeakTopOptions, type PeakTop } from "./fit-peak-top";
export { halfHeightCrossings, type HalfHeightCrossingsOptions } from "./half-height-crossings";
export { countCurvatureMinima, type CountCurvatureMinimaOptions } from "./count-curvature-minima";
export { gaussianCentreBound, type GaussianCentreBoundOptions } from "./gaussian-centre-bound";
export { xAtIndex } from "./x-at-index";
