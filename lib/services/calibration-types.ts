// The plain shapes of a lamp calibration as the calibrations service returns it: what pages and the API
// see; no Sequelize instance or column name gets past the service.

export interface CalibrationPairRecord {
  pixel: number;
  wavelengthNm: number;
  residualNm: number;
  species: string | null;
  lineId: string | null;
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
  uncertainty: { medianNm: number; maxNm: number };
  /** Calibrated wavelength now minus under the previous calibration, at a few pixels. */
  drift: {
    previousCalibrationId: string;
    pixels: number[];
    deltaNm: number[];
    maxAbsNm: number;
  } | null;
  /** How the pairs were found; excludedByHand/addedByHand count the workbench's edits (absent on older rows). */
  pairing: {
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
  };
  warnings: { code: string; message: string }[];
  softwareVersion: string;
  calibratedOn: string;
  createdAt: string;
}
