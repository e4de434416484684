// Shapes shared by automatic and manual pairing of lamp peaks with known lamp lines.
import type { CalibrationPair, DispersionKind } from "../types";
import type { FitCalibrationResult } from "./fit-calibration";

/** A peak found in the lamp spectrum, on the input axis. */
export interface LampPeak {
  x: number;
  xUncertainty?: number;
  height: number;
  /** FWHM in x units, when the peak finder measured it; tells pairing which lines blend into one peak. */
  fwhm?: number;
  /** True when the peak finder found the peak overlapping a neighbour (its centre is partly the neighbour's). */
  blended?: boolean;
  /** Height over the noise, when the peak finder measured it: how far the width can be trusted. */
  snr?: number;
}

/** A known lamp line. */
export interface LampLine {
  wavelengthNm: number;
  /** Relative intensity on the table's scale (larger is stronger). */
  intensity: number;
  species: string;
  id: string;
}

/** A pair found by pairing, pointing back into the caller's arrays. */
export interface LampPair extends CalibrationPair {
  peakIndex: number;
  lineIndex: number;
}

/** One check of a pairing, with its measure and, when it fails, why in words. */
export interface PairingCheck {
  name:
    | "pairs"
    | "residuals"
    | "leave-one-out"
    | "lopsided-support"
    | "model-agreement"
    | "expected-lines"
    | "fit-miss"
    | "lack-of-fit"
    | "held-out"
    | "pair-influence"
    | "end-pairs"
    | "rival-pairing"
    | "second-search"
    | "drift-precision"
    | "daily-drift"
    | "previous-fit";
  passed: boolean;
  /** The check's measure (see each check); larger is worse except for "expected-lines" and "pairs". */
  value: number;
  /** Why it failed, in words a chemist understands; empty when it passed. */
  reason: string;
}

/** Settings both pairing entry points share. */
export interface LampPairingOptions {
  /** The instrument's nominal wavelength range, nm. Only lines inside it (plus a margin) are considered. */
  nominalRangeNm: [number, number];
  dispersion: DispersionKind;
  /** The array's extent on the input axis [xMin, xMax] (pixels, or factory nm). */
  domain: [number, number];
  /**
   * The instrument's resolution in nm (at the mean dispersion); sets the matching tolerance.
   * @default nominal span / 500 (about 1 nm for a 350–900 nm instrument; common practice for small arrays)
   */
  resolutionNm?: number;
  /**
   * Confidence below which the result is "needs-manual". Unrelated peaks score below ~0.1 and true
   * pairings with a fifth of the lines missing ~0.45–0.85 in the synthetic tests.
   * @default 0.35
   */
  minConfidence?: number;
}

/** Outcome of pairing. */
export interface LampPairingResult {
  /**
   * "paired": trusted (every check passed); "check": a calibration was found but a check failed — it is
   * in `candidate` and `reasons` says why, for a person to confirm or correct; "needs-manual": nothing
   * usable was found.
   */
  status: "paired" | "check" | "needs-manual";
  /** The checks of an automatic pairing (absent for manual pairing, whose pairs a person chose). */
  checks?: PairingCheck[];
  /** Why the pairing is not trusted, in sentences; empty when paired. */
  reasons?: string[];
  /** The untrusted calibration of a "check" result (its pairs are in `suggestion`); null otherwise. */
  candidate?: FitCalibrationResult | null;
  /**
   * 0..1: (½·fraction of the strongest lines that found a peak + ½·fraction of the strongest peaks that
   * found a line) × (1 − exp(−(pairs − parameters)/4)) × clamp(1 − 2·rmsX/toleranceX, 0, 1). Chance
   * coincidences scatter uniformly over the tolerance (rms ≈ 0.58 tolerance), true pairs sit far inside.
   */
  confidence: number;
  /** The pairs, when status is "paired"; empty otherwise (no wrong pairs are handed on). */
  pairs: LampPair[];
  /** The fit of the pairs, when status is "paired". */
  model: FitCalibrationResult | null;
  /** The best attempt even when it was not trusted, for a manual pairing screen to start from. */
  suggestion: LampPair[];
  /** A competing pairing that explains the spectrum nearly as well, when there is one (status "check"). */
  rivalSuggestion?: LampPair[];
  unmatchedPeaks: LampPeak[];
  unmatchedLines: LampLine[];
  message: string;
}
