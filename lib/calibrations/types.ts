// A lamp calibration as the services store it (its JSON columns) and hand it to pages and reports: plain
// shapes with no Sequelize instance or column name, imported by services, reports and pages alike.

export interface CalibrationPairRecord {
  pixel: number;
  wavelengthNm: number;
  residualNm: number;
  species: string | null;
  lineId: string | null;
}

/** The calibration's uncertainty across the covered range. */
export interface CalibrationUncertainty {
  medianNm: number;
  maxNm: number;
}

/** Calibrated wavelength now minus under the previous calibration, at a few pixels. */
export interface CalibrationDrift {
  previousCalibrationId: string;
  pixels: number[];
  deltaNm: number[];
  maxAbsNm: number;
}

/** How the pairs were found; excludedByHand/addedByHand count the workbench's edits (absent on older rows). */
export interface CalibrationPairing {
  status: string;
  confidence: number;
  message: string;
  manualSeeds: number;
  excludedByHand?: number;
  addedByHand?: number;
  handPairs?: {
    change: "excluded" | "added";
    pixel: number;
    wavelengthNm: number;
    species: string;
  }[];
  /** A doubtful calibration saved as the default anyway: who said why, and the doubts they answered. */
  confirmation?: { reason: string; doubts: string[]; by: string };
}

export interface CalibrationWarningRecord {
  code: string;
  message: string;
}

export interface CalibrationRecord {
  id: string;
  /** Tells calibrations apart: "Ne+Ar · 14:05 · polynomial-3 · RMS 0.012 nm · 402–918 nm" (time in UTC). */
  label: string;
  instrumentId: string;
  spectrumId: string;
  lineReleaseId: string;
  lamps: string[];
  requestedModel: string;
  /** "polynomial-3", "hartmann" or "prism". */
  model: string;
  rmsNm: number;
  dof: number;
  pairs: CalibrationPairRecord[];
  rejected: CalibrationPairRecord[];
  coveredRangeNm: [number, number];
  uncertainty: CalibrationUncertainty;
  drift: CalibrationDrift | null;
  pairing: CalibrationPairing;
  warnings: CalibrationWarningRecord[];
  softwareVersion: string;
  calibratedOn: string;
  createdAt: string;
}
