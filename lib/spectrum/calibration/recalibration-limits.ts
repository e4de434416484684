// The tuned numbers of a recalibration from the previous calibration (recalibrate-from-previous.ts):
// the limits its checks hold a drift to, and how close a pair must sit to count as on a drift.

/**
 * Limits of the recalibration's checks, in matching tolerances (half the peaks' median FWHM) where
 * they are distances; tuned on the re-recorded realistic-lamp sweep (`npm run sweep -- --previous`).
 */
export const RECALIBRATION_LIMITS = {
  /** Fewest lamp lines on the drift: two fix it, the rest test it. */
  minPairs: 4,
  /** Largest RMS of the pairs about the drift (true pairs sit far inside a tolerance, chance ones scatter over it). */
  maxScatter: 0.25,
  /** Largest score of any clearly different drift, as a share of the best one's. */
  maxRivalShare: 0.6,
  /**
   * Largest 1σ uncertainty of the drift inside the covered range, in tolerances (half a FWHM), so that
   * about three σ stay within a tenth of a FWHM, the accuracy a calibration is held to. Measured on the
   * re-recorded sweep (seeds 123456 and 223456, n 200 each): 0.1 gave 81.0 % success and 2 silent
   * wrongs of 200 on the first; 0.07 gave 79.3 % and 81.3 % with 1 of 200 each; 0.05, 69.6 % and 76.4 %.
   */
  maxDriftSigma: 0.07,
  /** The covered range of a day's drift reaches at most this share of the array beyond the outermost lines. */
  maxExtrapolationShare: 0.25,
  /**
   * A day's drift (temperature, a knock; common practice puts it at a few pixels and a few tenths of a
   * per cent of stretch) stretches the array by at most this much and moves its middle by at most this
   * share of it; a larger one is a realignment and is trusted only between its lines.
   */
  maxDailyStretch: 0.005,
  maxDailyShiftShare: 0.01,
  /**
   * Smallest share of the array the covered range must span to be trusted without a check (outside it,
   * runs are warned that they extrapolate; as the instrument's default it needs a reason below 60 %).
   * Measured on the re-recorded sweep (seeds 123456 and 423456, n 200): 0.3 gave 81.0 and 85.0 %
   * success, 0.2 gave 82.6 and 87.2 %, 0.1 gave 85.9 and 88.2 %, each with the same silent wrongs.
   */
  minCoveredShare: 0.2,
  /** Largest RMS of the previous calibration's own fit, in today's matching tolerances (nm). */
  maxPreviousRms: 0.05,
  /** Smallest share of the strongest lamp lines on the array that must have found their peak. */
  minExpectedShare: 0.5,
  /** Largest departure of a quadratic drift from the straight one anywhere on the array, when significant. */
  maxBend: 0.15,
};

/** A pair counts as on the drift within this many tolerances at most (a pulled or stray peak stands further off)… */
export const ON_DRIFT_MAX = 0.15;
/** …and at least within this many, or 2.5 σ of its centre where that is wider. */
export const ON_DRIFT_MIN = 0.1;
/**
 * The consensus that chooses the drift counts lines within this many tolerances only (measured on the
 * re-recorded sweep, seed 50000: a reach of 0.3 let pulled pairs tilt the drift, 3 silently wrong of 200).
 */
export const CONSENSUS_REACH = 0.1;
