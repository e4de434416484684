// Plain shapes the workflow services return (instruments, spectra, calibrations, notebooks, runs):
// what pages and the API see; no Sequelize instance or column name gets past the services.
import type { RunStatus } from "@/lib/runs/types";
import type { AxisUnit, FirstColumnKind, SourceKind, WavelengthMedium } from "@/lib/spectrum/types";
import type { Verdict } from "@/lib/spectrum/matching";
import packageJson from "@/package.json";

// The run and calibration records live with their rules, outside the services, so lib/reports can
// read them; components/workflow still imports them from here until it moves (then it imports them
// from lib/runs/types and lib/calibrations/types, and this line goes).
export type { RunCall, RunPeak, RunRecord, RunStatus, RunTemperature } from "@/lib/runs/types";
export type { CalibrationRecord } from "@/lib/calibrations/types";

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
