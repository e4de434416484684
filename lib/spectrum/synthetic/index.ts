// Public API of the synthetic-spectrum generator.
export { makeRandom } from "./make-random";
export type { SeededRandom } from "./make-random";
export { synthesizeSpectrum } from "./synthesize-spectrum";
export type {
  SyntheticBand,
  SyntheticBandTruth,
  SyntheticContinuum,
  SyntheticLine,
  SyntheticLineTruth,
  SyntheticSpectrum,
  SynthesizeSpectrumOptions,
} from "./synthesize-spectrum";
