// How many samples to average so that a line of a known width keeps a few samples across it.

/**
 * The binning factor that leaves about `samplesPerFwhm` samples across a line `resolutionSamples`
 * wide (1 when the line is already that coarsely sampled, or when its width is unknown).
 * @param samplesPerFwhm - samples to keep across one FWHM; 6 keeps the smoothing window (9) near
 *   1.5 FWHM, where it lowers a Gaussian line's height by only a few per cent
 */
export function binningFactorFor(resolutionSamples: number, samplesPerFwhm = 6): number {
  if (!(resolutionSamples > 0) || !Number.isFinite(resolutionSamples)) return 1;
  if (!(samplesPerFwhm > 0))
    throw new RangeError(`samplesPerFwhm must be positive, got ${samplesPerFwhm}`);
  return Math.max(1, Math.floor(resolutionSamples / samplesPerFwhm));
}
