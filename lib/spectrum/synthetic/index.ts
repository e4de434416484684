// Public API of the synthetic-spectrum generator.
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
