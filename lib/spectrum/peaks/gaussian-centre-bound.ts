// The smallest centre uncertainty any estimator can reach for a Gaussian line in white noise.

export interface GaussianCentreBoundOptions {
  /** Full width at half maximum, in x units. */
  fwhm: number;
  /** Sample spacing at the line, in x units. */
  spacing: number;
  /** Peak height over per-sample noise σ. */
  snr: number;
}

/**
 * Cramér–Rao bound for the centre of a sampled Gaussian of height A and standard deviation
 * s = FWHM / (2√(2 ln 2)) in white noise σ, with sample spacing Δ:
 * the Fisher information is (A/σ)² Σ (u/s²)² e^(−u²/s²) ≈ (A/σ)² √π / (2 s Δ), so
 * σ_x ≥ √(2 s Δ / √π) / SNR = 0.69 · √(FWHM · Δ) / SNR.
 * This is the form σ_x = C·√(FWHM·Δ)/SNR with C ≈ 0.7 for Gaussian lines given by
 * Lenz & Ayres (1992, PASP 104, 1104) (from memory; the constant here is derived, not copied).
 */
export function gaussianCentreBound(options: GaussianCentreBoundOptions): number {
  const { fwhm, spacing, snr } = options;
  if (!(fwhm > 0) || !(spacing > 0) || !(snr > 0)) return Infinity;
  const sigma = fwhm / (2 * Math.sqrt(2 * Math.LN2));
  return Math.sqrt((2 * sigma * spacing) / Math.sqrt(Math.PI)) / snr;
}
