// The shapes of the calibration workbench's computation (editLampCalibration and its stages): the
// chemist's edits, the options, and the edited calibration the service saves and serves.
import type { CalibrationModelChoice } from "../calibration/calibration-model-choice";
import type { FitCalibrationResult } from "../calibration/fit-calibration";
import type { GlassName } from "../calibration/glass-catalogue";
import type { LampPairingResult } from "../calibration/lamp-pairing-types";
import type { UnpairedPeakReasonCode } from "../calibration/unpaired-lamp-peaks";
import type { DispersionKind } from "../types";

/** A pair as the chemist names it: the peak by its pixel, the line by its wavelength. */
export interface HandPair {
  pixel: number;
  wavelengthNm: number;
}

export interface LampCalibrationEdits {
  /** Two or three pairs picked by hand that replace the automatic pairing (extended to a full pairing). */
  seeds?: HandPair[];
  /** Pairs made by hand: each overrides whatever the pairing did with that peak or that line. */
  added?: HandPair[];
  /** Pairs left out of the fit (matched within 1 pixel and HAND_LINE_MATCH_NM). */
  excluded?: HandPair[];
  /** The model to fit; "auto" keeps the pairing's.
   * @default "auto" */
  model?: CalibrationModelChoice;
}

export interface EditLampCalibrationOptions {
  /** The instrument's nominal range, nm (seed pairs are extended over it). */
  nominalRangeNm: [number, number];
  dispersion: DispersionKind;
  /** Instrument resolution (FWHM) in nm: the width of a peak the model cannot turn into nm.
   * @default nominal span / 500 */
  resolutionNm?: number;
  /** The array's first and last pixel. */
  domain: [number, number];
  /** The prism's glass, when the instrument names one. */
  glass?: GlassName;
  /** The prism's apex angle in degrees, when the instrument states one. */
  apexDeg?: number;
}

/** A pair with its residual under the fitted model. */
export interface LampPairRecord {
  pixel: number;
  wavelengthNm: number;
  residualNm: number;
  species: string | null;
  lineId: string | null;
}

/** A pair as the workbench shows it: where it came from and whether the fit used it. */
export interface WorkbenchPair extends LampPairRecord {
  /** "auto": found by the pairing; "added": made by hand. */
  origin: "auto" | "added";
  /** "used" in the fit, "rejected" by the fit's outlier rejection, or "excluded" by hand. */
  state: "used" | "rejected" | "excluded";
}

/** One model of the comparison, fitted to the same pairs. */
export interface WorkbenchModelRow {
  /** "polynomial-2", "hartmann", "prism": the value of the model selector. */
  model: CalibrationModelChoice;
  parameterCount: number | null;
  rmsNm: number | null;
  aicc: number | null;
  bic: number | null;
  /** λ ± 1σ at the array's first and last pixel: how the model extrapolates. */
  ends: { pixel: number; wavelengthNm: number; uncertaintyNm: number }[] | null;
  glass: string | null;
  /** True when the prism's glass terms were fitted from the pairs, starting from `glass`. */
  glassFitted: boolean;
  /** Why it could not be fitted. */
  failure: string | null;
}

/** An unpaired peak's reason in words the workbench shows as they are. */
export interface UnpairedPeakExplanation {
  code: UnpairedPeakReasonCode;
  /** "too broad for one lamp line", "blend", "not in the table", "line paired with another peak", "left unpaired", "no wavelength". */
  reason: string;
  lines: { wavelengthNm: number; species: string }[];
}

/** How the pairs were found and what the chemist changed, as the saved calibration records it. */
export interface WorkbenchPairingRecord {
  status: LampPairingResult["status"];
  confidence: number;
  message: string;
  manualSeeds: number;
  excludedByHand: number;
  addedByHand: number;
  handPairs: {
    change: "excluded" | "added";
    pixel: number;
    wavelengthNm: number;
    species: string;
  }[];
}

export interface EditedLampCalibration {
  /** The chosen model's fit (its pairs in the workbench's order: auto pairs, then added ones). */
  fit: FitCalibrationResult;
  result: {
    /** "polynomial-3", "hartmann" or "prism". */
    model: CalibrationModelChoice;
    rmsNm: number;
    dof: number;
    /** Every pair: used, rejected by the fit, or excluded by hand; by pixel. */
    pairs: WorkbenchPair[];
    coveredRangeNm: [number, number];
    uncertainty: { medianNm: number; maxNm: number };
    warnings: { code: string; message: string }[];
    pairing: WorkbenchPairingRecord;
    /** Why this calibration should not silently become the instrument's default (see calibrationDoubts). */
    doubts: string[];
    /** A competing automatic pairing that explains the lamp nearly as well (empty when there is none). */
    rival: { pixel: number; wavelengthNm: number; species: string }[];
  };
  comparison: {
    candidates: WorkbenchModelRow[];
    recommended: CalibrationModelChoice | null;
    reason: string;
  };
  /** The lamp's peaks, with the wavelength the fitted model puts them at and their line when paired. */
  peaks: {
    pixel: number;
    height: number;
    fwhm: number;
    snr: number;
    predictedNm: number | null;
    pairedWith: { wavelengthNm: number; species: string } | null;
    /** Why an unpaired peak is unpaired (null when paired). */
    unpaired: UnpairedPeakExplanation | null;
  }[];
  /** The lamp lines, with a blend the pairing paired at its centroid as a line of its own. */
  lines: {
    wavelengthNm: number;
    species: string;
    intensity: number;
    lineId: string;
    paired: boolean;
  }[];
  /**
   * The tolerances the workbench states, as applied here: a line given by hand must lie within
   * lineMatchNm of a table line; an expected line "has a peak" within expectedPeakReachFwhm local FWHMs.
   */
  tolerances: { lineMatchNm: number; expectedPeakReachFwhm: number };
  /** Unpaired lamp lines the calibration puts on the array with no peak within reach: below the peak threshold. */
  expectedWithoutPeak: {
    wavelengthNm: number;
    species: string;
    intensity: number;
    reason: "below threshold";
  }[];
}

/** A pair the workbench works with: a peak and a line by index, and where the pair came from. */
export interface WorkPair {
  peakIndex: number;
  lineIndex: number;
  origin: "auto" | "added";
}
