// The canonical content of a run that a signature covers: a deterministic JSON (keys sorted at every
// level, arrays in their stored order) of what the run is made from and what it says, and its SHA-256.
// It leaves out the review state (status, round, times), so the hash of a signed run recomputed later
// equals the one signed. Pure and free of the database, so tests and reports recompute it from rows.
import { createHash } from "node:crypto";
import { standingVerdicts } from "@/lib/runs/standing-verdicts";
import type {
  RunPeak,
  RunSettings,
  RunUnexplainedPeak,
  RunWarning,
  StoredRunCall,
} from "@/lib/runs/types";
import type { Verdict } from "@/lib/spectrum/matching";

/** The plain facts a run's content is built from; the service (or a test) reads them from the tables. */
export interface RunContentSource {
  run: {
    id: string;
    teamId: string;
    notebookId: string;
    spectrumId: string;
    calibrationId: string | null;
    lineReleaseId: string;
    source: string;
    settings: RunSettings;
    lampChecked: boolean;
    softwareVersion: string;
    rangeMinNm: number;
    rangeMaxNm: number;
    noiseCounts: number;
    peaks: RunPeak[];
    calls: StoredRunCall[];
    unexplained: RunUnexplainedPeak[];
    warnings: RunWarning[];
    notes: string;
    versionNumber: number;
    amendsRunId: string | null;
    rerunOfId: string | null;
    createdById: string | null;
  };
  spectrumSha256: string;
  calibration: { id: string; model: string; rmsNm: number } | null;
  lineRelease: { id: string; number: number | null };
  /** Every override of the run, oldest first. */
  overrides: {
    id: string;
    species: string;
    computedVerdict: Verdict;
    verdict: Verdict | null;
    reason: string;
    createdById: string | null;
    createdAt: string;
  }[];
}

export const RUN_CONTENT_FORMAT = "emberline-run-content/1";

/** The record a signature covers. Calls carry the verdict that stands after the overrides. */
export function buildRunContent(source: RunContentSource): Record<string, unknown> {
  const { run } = source;
  const standing = standingVerdicts(run.calls, source.overrides);
  const calls = run.calls.map((call) => ({
    ...call,
    computedVerdict: call.verdict,
    standingVerdict: standing[call.species],
  }));
  return {
    format: RUN_CONTENT_FORMAT,
    runId: run.id,
    teamId: run.teamId,
    notebookId: run.notebookId,
    authorId: run.createdById,
    versionNumber: run.versionNumber,
    amendsRunId: run.amendsRunId,
    rerunOfId: run.rerunOfId,
    spectrum: { id: run.spectrumId, sha256: source.spectrumSha256 },
    calibration: source.calibration
      ? {
          id: source.calibration.id,
          model: source.calibration.model,
          rmsNm: source.calibration.rmsNm,
        }
      : null,
    lineRelease: { id: source.lineRelease.id, number: source.lineRelease.number },
    source: run.source,
    settings: run.settings,
    softwareVersion: run.softwareVersion,
    lampChecked: run.lampChecked,
    rangeNm: [run.rangeMinNm, run.rangeMaxNm],
    noiseCounts: run.noiseCounts,
    warnings: run.warnings,
    peaks: run.peaks,
    calls,
    unexplained: run.unexplained,
    overrides: source.overrides.map((o) => ({
      id: o.id,
      species: o.species,
      computedVerdict: o.computedVerdict,
      verdict: o.verdict,
      reason: o.reason,
      byId: o.createdById,
      at: o.createdAt,
    })),
    notes: run.notes,
  };
}

/** JSON with object keys sorted at every level; `undefined` members are left out as JSON.stringify does. */
export function canonicalJson(value: unknown): string {
  return JSON.stringify(sortKeys(value));
}

function sortKeys(value: unknown): unknown {
  if (Array.isArray(value)) return value.map(sortKeys);
  if (value && typeof value === "object" && !(value instanceof Date)) {
    const sorted: Record<string, unknown> = {};
    for (const key of Object.keys(value).sort())
      sorted[key] = sortKeys((value as Record<string, unknown>)[key]);
    return sorted;
  }
  return value;
}

/** SHA-256 (lower-case hex) of the canonical JSON of a run's content. */
export function runContentHash(content: Record<string, unknown>): string {
  return createHash("sha256").update(canonicalJson(content), "utf8").digest("hex");
}

/** The calibration model's label as the calibration records show it ("polynomial-3", "hartmann", "prism"). */
export function calibrationModelLabel(model: { kind: string; degree?: number }): string {
  return model.kind === "polynomial" ? `polynomial-${model.degree}` : model.kind;
}
