// The plain shapes of a run as the runs service returns it (its peaks, calls, overrides, temperature,
// and what a re-run changed): what pages and the API see; no Sequelize instance or column name gets past
// the services.
import type { Verdict } from "@/lib/spectrum/matching";
import type { DetectionLimit } from "@/lib/spectrum/analysis/detection-limits";
import type { SourceKind } from "@/lib/spectrum/types";
import type { RunStatus } from "@/models/run";

export type { RunStatus };

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
