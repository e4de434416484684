// Plain shapes the workflow services return (instruments, spectra, calibrations, notebooks, runs):
// what pages and the API see; no Sequelize instance or column name gets past the services.
import type { AxisUnit, FirstColumnKind, SourceKind, WavelengthMedium } from "@/lib/spectrum/types";
import type { Verdict } from "@/lib/spectrum/matching";
import type { DetectionLimit } from "@/lib/spectrum/analysis/detection-limits";
import packageJson from "@/package.json";
import type { RunStatus } from "@/models/run";

export type { RunStatus };

export interface InstrumentRecord {
  id: string;
  teamId: string;
  name: string;
  dispersion: "prism" | "grating";
  pixels: number;
  nominalMinNm: number;
  nominalMaxNm: number;
  resolutionNm: number;
  detectorMax: number | null;
  glass: string | null;
  apexDeg: number | null;
  /** Export profile: what the first column of its files holds, for files that do not say; null: not set. */
  exportXUnit: FirstColumnKind | null;
  /** Air or vacuum, for a wavelength profile; null when not known or not a wavelength. */
  exportMedium: WavelengthMedium | null;
  /** Optimistic-locking version: send it back with an edit. */
  version: number;
  createdAt: string;
  /** The newest calibration, the default for new runs; null when the instrument has none yet. */
  latestCalibrationId: string | null;
}

export interface SpectrumRecord {
  id: string;
  teamId: string;
  instrumentId: string;
  kind: "lamp" | "sample";
  label: string;
  fileName: string;
  byteSize: number;
  sha256: string;
  points: number;
  xUnit: AxisUnit;
  medium: WavelengthMedium | null;
  xRange: [number, number];
  uploadedAt: string;
  uploadedById: string | null;
  /** An earlier upload of the same bytes in the team (the oldest), when there is one. */
  duplicateOf: { id: string; fileName: string; uploadedAt: string } | null;
}

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

export interface NotebookRecord {
  id: string;
  teamId: string;
  title: string;
  /** Optimistic lock: a rename sends the version it was made from. */
  version: number;
  createdAt: string;
  /** The newest of the notebook's own change and its runs' creation or change. */
  lastActivityAt: string;
  runCount: number;
  statusCounts: Record<RunStatus, number>;
}

/** One run as a notebook lists it. */
export interface RunSummary {
  id: string;
  status: RunStatus;
  /** 1 for the first version; amendments count up. */
  versionNumber: number;
  spectrumId: string;
  spectrumLabel: string;
  spectrumFileName: string;
  instrumentId: string;
  instrumentName: string;
  source: SourceKind;
  /** Species whose standing verdict (after overrides) is present. */
  present: string[];
  authorId: string | null;
  authorName: string | null;
  createdAt: string;
}

export interface RunPeak {
  x: number;
  wavelengthNm: number;
  uncertaintyNm: number;
  fwhmNm: number;
  height: number;
  snr: number;
  saturated: boolean;
  blended: boolean;
}

/** One call as the analysis stored it (`verdict` is the computed one). */
export interface StoredRunCall {
  species: string;
  element: string;
  verdict: Verdict;
  score: number;
  lines: {
    lineId: string;
    lineNm: number;
    peakNm: number;
    deltaNm: number;
    relativeIntensity: number | null;
  }[];
  missing: {
    lineId: string;
    lineNm: number;
    relativeIntensity: number;
    predictedSnr: number | null;
    hidden: boolean;
  }[];
  seenCount: number;
  /** Peaks the seen lines stand on (lines blended into one peak are one piece of evidence); absent
   * on runs stored before it was kept. */
  seenPeaks?: number;
  missingCount: number;
  missingStrongCount: number;
  overlaps: { peakNm: number; otherSpecies: string[] }[];
  intensityBasis: string;
  notes: string[];
  rationale: string;
  /** For an absent call: the least height its strongest line in range needed to be found (an upper
   * limit on the line); absent on runs stored before limits were computed. */
  detectionLimit?: StoredDetectionLimit | null;
}

/** Stored as the analysis gives it. */
export type StoredDetectionLimit = DetectionLimit;

/** One call as pages and the API see it: `verdict` is the standing verdict (the newest override's
 * when one applies), `computedVerdict` what the analysis found, `override` the override that
 * stands (null when there is none or the newest one was withdrawn). */
export interface RunCall extends StoredRunCall {
  computedVerdict: Verdict;
  override: RunOverrideRecord | null;
}

/** The newest override of one call: the verdict the chemist chose (null: withdrawn) and why. */
export interface RunOverrideRecord {
  id: string;
  species: string;
  computedVerdict: Verdict;
  verdict: Verdict | null;
  reason: string;
  byName: string | null;
  at: string;
}

/** A Boltzmann excitation temperature from one species' lines, or why none could be found. */
export type RunTemperature =
  | {
      ok: true;
      species: string;
      temperatureK: number;
      temperatureUncertaintyK: number;
      lineCount: number;
      rSquared: number;
      points: { upperEv: number; y: number; wavelengthNm: number }[];
    }
  | { ok: false; message: string };

export interface RunRecord {
  id: string;
  notebookId: string;
  spectrumId: string;
  calibrationId: string | null;
  lineReleaseId: string;
  source: SourceKind;
  status: RunStatus;
  /** 1 for the first version; an amendment of a signed run is the next version, linked by amendsRunId. */
  versionNumber: number;
  amendsRunId: string | null;
  /** The run this one repeats against a newer line-table release, when it is a re-run. */
  rerunOfId: string | null;
  createdById: string | null;
  notes: string;
  reviewRound: number;
  requestedReviewerId: string | null;
  submittedAt: string | null;
  signedAt: string | null;
  /** Optimistic lock for notes: PATCH sends the value it read; a stale one is refused (409). */
  lockVersion: number;
  /** The number of the line-table release the run used. */
  lineReleaseNumber: number | null;
  settings: { minSnr?: number; k?: number; temperatureK?: number };
  lampChecked: boolean;
  softwareVersion: string;
  rangeNm: [number, number];
  noiseCounts: number;
  warnings: { code: string; message: string }[];
  peaks: RunPeak[];
  /** The calls: `verdict` is the standing verdict, `computedVerdict` the analysis's, `override`
   * the override that stands (null when none). */
  calls: RunCall[];
  /** Per species, the verdict that stands: the newest override's when there is one, else the computed one. */
  verdicts: Record<string, Verdict>;
  /** The override history, oldest first (the newest per species applies). */
  overrides: RunOverrideRecord[];
  temperature: RunTemperature | null;
  unexplained: { wavelengthNm: number; height: number; snr: number; reason: string }[];
  createdAt: string;
}

/** What changed from an earlier run of the same sample to its re-run against a newer release. */
export interface RunChanges {
  earlierRunId: string;
  earlierReleaseNumber: number | null;
  releaseNumber: number | null;
  /** Species in both runs whose standing verdict or score changed. */
  changedCalls: {
    species: string;
    before: { verdict: Verdict; score: number };
    after: { verdict: Verdict; score: number };
  }[];
  /** Species the re-run weighs that the earlier run did not, with their verdict now. */
  newSpecies: { species: string; verdict: Verdict }[];
  /** Species the earlier run weighed that the re-run no longer does, with their verdict then. */
  goneSpecies: { species: string; verdict: Verdict }[];
  /** Peaks (nm) unexplained before that now have a candidate line. */
  newlyExplainedNm: number[];
  /** Peaks (nm) that had a candidate line before and are unexplained now. */
  newlyUnexplainedNm: number[];
}

/** The software version stored with every calibration and run (package.json's version). */
export const SOFTWARE_VERSION: string = packageJson.version;
