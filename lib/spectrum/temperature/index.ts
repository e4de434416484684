// Public API of the excitation-temperature tools.
export { BOLTZMANN_CONSTANT_EV_PER_K } from "./boltzmann-constant";
export { boltzmannPlot } from "./boltzmann-plot";
export type {
  BoltzmannLine,
  BoltzmannPlotOptions,
  BoltzmannPlotResult,
  BoltzmannPoint,
} from "./boltzmann-plot";
export { predictLteIntensities } from "./predict-lte-intensities";
export type { LteLine, PredictLteIntensitiesOptions } from "./predict-lte-intensities";
