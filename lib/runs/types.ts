// An identification run as the services store it (its JSON columns) and hand it to pages and reports:
// plain shapes with no Sequelize instance or column name, imported by services, reports and pages alike.
import type { DetectionLimit } from "@/lib/spectrum/analysis/detection-limits";
import type { ExcitationTemperature } from "@/lib/spectrum/analysis/excitation-temperature";
import type { Verdict } from "@/lib/spectrum/matching";
import type { SourceKind } from "@/lib/spectrum/types";

export const RUN_STATUSES = ["draft", "submitted", "returned", "signed"] as const;
export type RunStatus = (typeof RUN_STATUSES)[number];

/** The chemist's analysis settings; blank ones take the analysis's defaults. */
export interface RunSettings {
  minSnr?: number;
  k?: number;
  temperatureK?: number;
}

export interface RunWarning {
  code: string;
  message: string;
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

/** One peak's candidates as stored with the run. */
export interface StoredPeakMatch {
  peakIndex: number;
  candidates: {
    lineId: string;
    species: string;
    kind: string;
    referenceNm: number;
    deltaNm: number;
    sigmaNm: number;
    deltaSigma: number;
  }[];
}

/** A peak that lines of several species explain, as stored with the run. */
export interface StoredPeakOverlap {
  peakIndex: number;
  peakNm: number;
  species: string[];
}

/** A peak no line explains, and why. */
export interface RunUnexplainedPeak {
  wavelengthNm: number;
  height: number;
  snr: number;
  reason: string;
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

/** A Boltzmann excitation temperature from one species' lines, or why none could be found; stored as the analysis gives it. */
export type RunTemperature = ExcitationTemperature;

/** What a notes save answers: the notes as saved and the version the next save must name. */
export interface RunNotesRecord {
  id: string;
  notes: string;
  lockVersion: number;
  updatedAt: string;
}

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
  settings: RunSettings;
  lampChecked: boolean;
  softwareVersion: string;
  rangeNm: [number, number];
  noiseCounts: number;
  warnings: RunWarning[];
  peaks: RunPeak[];
  /** The calls: `verdict` is the standing verdict, `computedVerdict` the analysis's, `override`
   * the override that stands (null when none). */
  calls: RunCall[];
  /** Per species, the verdict that stands: the newest override's when there is one, else the computed one. */
  verdicts: Record<string, Verdict>;
  /** The override history, oldest first (the newest per species applies). */
  overrides: RunOverrideRecord[];
  temperature: RunTemperature | null;
  unexplained: RunUnexplainedPeak[];
  createdAt: string;
}
