// Everything a run's report shows, assembled from plain records in one pure function: the PDF, the
// printable page and the tests read the same model, so the two renderings cannot drift apart.
import type { Verdict } from "@/lib/spectrum/matching";
import type { SourceKind } from "@/lib/spectrum/types";
import type { CalibrationRecord } from "@/lib/calibrations/types";
import type { RunCall, RunRecord, RunStatus, RunTemperature } from "@/lib/runs/types";
import { detectionLimitText } from "./detection-limit-text";
import { FLAME_CAUTIONS, SCREENING_CAVEAT } from "./report-text";

/** A signature as stored in run_signatures. */
export interface ReportSignature {
  signerName: string;
  meaning: string;
  signedAt: string;
  contentHash: string;
  round: number;
}

/** A review round as stored in run_rounds, with names instead of ids. */
export interface ReportRound {
  round: number;
  submittedByName: string | null;
  submittedAt: string;
  requestedReviewerName: string | null;
  decision: "returned" | "signed" | null;
  decidedByName: string | null;
  decidedAt: string | null;
  comment: string;
}

export interface RunReportInput {
  run: RunRecord;
  calibration: CalibrationRecord | null;
  release: { id: string; number: number | null; publishedAt: string | null };
  spectrum: { id: string; fileName: string; label: string; sha256: string; points: number };
  instrument: { name: string; dispersion: string };
  notebook: { id: string; title: string };
  authorName: string | null;
  signature: ReportSignature | null;
  rounds: ReportRound[];
  /** When the report was made (ISO 8601). */
  generatedAt: string;
}

export interface ReportCall {
  species: string;
  element: string;
  /** The verdict that stands (after overrides). */
  verdict: Verdict;
  computedVerdict: Verdict;
  /** The newest override's reason when one changed or confirmed the verdict. */
  override: { verdict: Verdict | null; reason: string; byName: string | null; at: string } | null;
  score: number;
  seenCount: number;
  missingCount: number;
  missingStrongCount: number;
  lines: RunCall["lines"];
  missing: RunCall["missing"];
  overlaps: RunCall["overlaps"];
  intensityBasis: string;
  rationale: string;
  notes: string[];
}

export interface ReportField {
  label: string;
  value: string;
}

export interface RunReport {
  title: string;
  runId: string;
  shortId: string;
  versionNumber: number;
  status: RunStatus;
  source: SourceKind;
  createdAt: string;
  generatedAt: string;
  notebookTitle: string;
  authorName: string | null;
  instrumentName: string;
  /** Called present or possible, strongest first. */
  calls: ReportCall[];
  /** Candidates that did not reach "possible": listed briefly so the reader sees what was weighed. */
  absentSpecies: string[];
  /** The same species with their detection limits in words ("—" where none), for the report. */
  absentLimits: { species: string; limit: string }[];
  /** Standing verdicts of every candidate species (for labels and CSVs). */
  verdicts: Record<string, Verdict>;
  calibration: {
    id: string;
    model: string;
    rmsNm: number;
    coveredRangeNm: [number, number];
    pairCount: number;
    rejectedCount: number;
    lamps: string[];
    calibratedOn: string;
    medianUncertaintyNm: number;
  } | null;
  release: { id: string; number: number | null; publishedAt: string | null };
  spectrum: RunReportInput["spectrum"];
  rangeNm: [number, number];
  outsideCoveredRange: boolean;
  lampChecked: boolean;
  settings: ReportField[];
  softwareVersion: string;
  noiseCounts: number;
  temperature: RunTemperature | null;
  warnings: string[];
  unexplained: RunRecord["unexplained"];
  peakCount: number;
  signature: ReportSignature | null;
  rounds: ReportRound[];
  notes: string;
  caveat: string;
  flameCautions: string[] | null;
  /** The "made from" block, in order. */
  provenance: ReportField[];
}

const ORDER: Record<Verdict, number> = { present: 0, possible: 1, absent: 2 };

/** The first 8 hex digits of a uuid: enough to tell runs apart in a file name or a header. */
export function shortRunId(id: string): string {
  return id.replace(/-/g, "").slice(0, 8);
}

const SETTING_LABELS: Record<string, string> = {
  minSnr: "Minimum SNR",
  k: "Match window (k·σ)",
  temperatureK: "Assumed temperature (K)",
};

export function buildRunReport(input: RunReportInput): RunReport {
  const { run, calibration } = input;
  const newestOverride = new Map<string, RunRecord["overrides"][number]>();
  for (const o of run.overrides) newestOverride.set(o.species, o);

  const all: ReportCall[] = run.calls.map((call) => {
    const o = newestOverride.get(call.species);
    return {
      species: call.species,
      element: call.element,
      verdict: run.verdicts[call.species] ?? call.verdict,
      computedVerdict: call.computedVerdict,
      override: o ? { verdict: o.verdict, reason: o.reason, byName: o.byName, at: o.at } : null,
      score: call.score,
      seenCount: call.seenCount,
      missingCount: call.missingCount,
      missingStrongCount: call.missingStrongCount,
      lines: call.lines,
      missing: call.missing,
      overlaps: call.overlaps,
      intensityBasis: call.intensityBasis,
      rationale: call.rationale,
      notes: call.notes,
    };
  });
  all.sort(
    (a, b) =>
      ORDER[a.verdict] - ORDER[b.verdict] ||
      b.score - a.score ||
      a.species.localeCompare(b.species),
  );
  // A call the chemist overrode stays in the main list whatever it became, so the override is seen.
  const calls = all.filter((c) => c.verdict !== "absent" || c.override !== null);
  const absentSpecies = all
    .filter((c) => c.verdict === "absent" && c.override === null)
    .map((c) => c.species);
  const limitOf = new Map(run.calls.map((c) => [c.species, detectionLimitText(c.detectionLimit)]));
  const absentLimits = absentSpecies.map((species) => ({
    species,
    limit: limitOf.get(species) ?? "—",
  }));

  const outsideCoveredRange =
    calibration !== null &&
    (run.rangeNm[0] < calibration.coveredRangeNm[0] - 1e-9 ||
      run.rangeNm[1] > calibration.coveredRangeNm[1] + 1e-9);
  const warnings: string[] = [];
  if (!run.lampChecked)
    warnings.push(
      "Not lamp-checked: this run used the file's own wavelength axis, not a lamp calibration.",
    );
  if (outsideCoveredRange) {
    warnings.push(
      `The sample spans ${run.rangeNm[0].toFixed(1)}–${run.rangeNm[1].toFixed(1)} nm, past the calibrated range ` +
        `${calibration!.coveredRangeNm[0].toFixed(1)}–${calibration!.coveredRangeNm[1].toFixed(1)} nm: wavelengths outside it are extrapolated.`,
    );
  }
  for (const w of run.warnings) {
    if (outsideCoveredRange && w.code === "outside-covered-range") continue;
    warnings.push(w.message);
  }

  const settings: ReportField[] = Object.entries(run.settings)
    .filter(([, v]) => v !== undefined)
    .map(([key, value]) => ({ label: SETTING_LABELS[key] ?? key, value: String(value) }));
  if (settings.length === 0) settings.push({ label: "Settings", value: "the defaults" });

  const shortId = shortRunId(run.id);
  const provenance: ReportField[] = [
    { label: "Run", value: `${run.id} (version ${run.versionNumber})` },
    { label: "Notebook", value: input.notebook.title },
    { label: "Author", value: input.authorName ?? "unknown" },
    { label: "Instrument", value: `${input.instrument.name} (${input.instrument.dispersion})` },
    { label: "Source", value: run.source },
    {
      label: "Sample file",
      value: `${input.spectrum.fileName} (${input.spectrum.points.toLocaleString("en")} points)`,
    },
    { label: "Sample SHA-256", value: input.spectrum.sha256 },
    {
      label: "Line-table release",
      value:
        `${input.release.number === null ? "unnumbered" : `release ${input.release.number}`}` +
        `${input.release.publishedAt ? `, published ${input.release.publishedAt.slice(0, 10)}` : ""} (${input.release.id})`,
    },
    {
      label: "Calibration",
      value: calibration
        ? `${calibration.model}, RMS ${calibration.rmsNm.toFixed(4)} nm (${calibration.id})`
        : "none: the file's own axis",
    },
    { label: "Software", value: `Emberline ${run.softwareVersion}` },
    { label: "Noise", value: `${run.noiseCounts.toFixed(2)} counts` },
    { label: "Analysed", value: formatUtc(run.createdAt) },
  ];

  return {
    title: `Emberline run ${shortId} v${run.versionNumber}: ${input.spectrum.label || input.spectrum.fileName}`,
    runId: run.id,
    shortId,
    versionNumber: run.versionNumber,
    status: run.status,
    source: run.source,
    createdAt: run.createdAt,
    generatedAt: input.generatedAt,
    notebookTitle: input.notebook.title,
    authorName: input.authorName,
    instrumentName: input.instrument.name,
    calls,
    absentSpecies,
    absentLimits,
    verdicts: run.verdicts,
    calibration: calibration
      ? {
          id: calibration.id,
          model: calibration.model,
          rmsNm: calibration.rmsNm,
          coveredRangeNm: calibration.coveredRangeNm,
          pairCount: calibration.pairs.length,
          rejectedCount: calibration.rejected.length,
          lamps: calibration.lamps,
          calibratedOn: calibration.calibratedOn,
          medianUncertaintyNm: calibration.uncertainty.medianNm,
        }
      : null,
    release: input.release,
    spectrum: input.spectrum,
    rangeNm: run.rangeNm,
    outsideCoveredRange,
    lampChecked: run.lampChecked,
    settings,
    softwareVersion: run.softwareVersion,
    noiseCounts: run.noiseCounts,
    temperature: run.temperature,
    warnings,
    unexplained: run.unexplained,
    peakCount: run.peaks.length,
    signature: input.signature,
    rounds: input.rounds,
    notes: run.notes,
    caveat: SCREENING_CAVEAT,
    flameCautions: run.source === "flame" ? FLAME_CAUTIONS : null,
    provenance,
  };
}

/** "2026-03-01 14:05 UTC" from an ISO 8601 time. */
export function formatUtc(iso: string): string {
  return `${iso.slice(0, 16).replace("T", " ")} UTC`;
}

export const VERDICT_WORDS: Record<Verdict, string> = {
  present: "present",
  possible: "possible",
  absent: "absent",
};
