// Public API of signal preparation: smoothing, derivatives, noise, continuum and saturation.
export {
  prepareSignal,
  MIN_SIGNAL_LENGTH,
  type PrepareSignalOptions,
  type PreparedSignal,
} from "./prepare-signal";
export { savitzkyGolay, type SavitzkyGolayOptions } from "./savitzky-golay";
export {
  savitzkyGolayCoefficients,
  assertSavitzkyGolayShape,
  type SavitzkyGolayCoefficientsOptions,
} from "./savitzky-golay-coefficients";
export { estimateNoise, type EstimateNoiseOptions } from "./estimate-noise";
export { estimateNoiseProfile, type EstimateNoiseProfileOptions } from "./estimate-noise-profile";
export { estimateContinuum, type BaselineOptions } from "./estimate-continuum";
export {
  asymmetricLeastSquares,
  type AsymmetricLeastSquaresOptions,
} from "./asymmetric-least-squares";
export {
  modifiedPolynomialBaseline,
  type ModifiedPolynomialBaselineOptions,
} from "./modified-polynomial-baseline";
export {
  solveSymmetricPentadiagonal,
  type SymmetricPentadiagonal,
} from "./solve-symmetric-pentadiagonal";
export { defaultBaselineFor } from "./default-baseline-for";
export {
  findSaturatedRanges,
  type FindSaturatedRangesOptions,
  type IndexRange,
} from "./find-saturated-ranges";
export { xMedian } from "./x-median";
export { assertFiniteArray } from "./assert-finite-array";
export { assertStrictlyIncreasing } from "./assert-strictly-increasing";
export { assertIntegerInRange } from "./assert-integer-in-range";
export { binSamples, type BinSamplesOptions } from "./bin-samples";
export { binningFactorFor } from "./binning-factor-for";
export { removeSpikes, type RemoveSpikesOptions, type RemovedSpikes } from "./remove-spikes";
