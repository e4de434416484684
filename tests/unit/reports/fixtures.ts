// Plain records for the report tests: a small flame run with a sodium doublet, a potassium line and
// an unexplained peak, its calibration, and the stored candidate matches.
import type { CalibrationRecord } from "@/lib/calibrations/types";
import type { RunCall, RunRecord, StoredPeakMatch } from "@/lib/runs/types";
import type { RunReportInput } from "@/lib/reports/report-model";

// Na I 588.995 / 589.592 nm and K I 766.490 nm in air (from memory).
export const NA_D2 = 588.995;
export const NA_D1 = 589.592;
export const K_LINE = 766.49;

function call(
  species: string,
  verdict: RunCall["verdict"],
  lines: [number, number, string][],
  score: number,
): RunCall {
  return {
    species,
    element: species.split(" ")[0],
    verdict,
    computedVerdict: verdict,
    override: null,
    score,
    lines: lines.map(([lineNm, peakNm, lineId]) => ({
      lineId,
      lineNm,
      peakNm,
      deltaNm: peakNm - lineNm,
      relativeIntensity: 1000,
    })),
    missing: [],
    seenCount: lines.length,
    missingCount: 0,
    missingStrongCount: 0,
    overlaps: [],
    intensityBasis: "flame",
    notes: [],
    rationale: `${lines.length} lines of ${species} seen within 2σ.`,
  };
}

export function sampleRun(overrides: Partial<RunRecord> = {}): RunRecord {
  const calls = [
    call(
      "Na I",
      "present",
      [
        [NA_D2, 589.001, "line-na-d2"],
        [NA_D1, 589.588, "line-na-d1"],
      ],
      0.93,
    ),
    call("K I", "possible", [[K_LINE, 766.52, "line-k"]], 0.41),
    // Invented demo figures: 5 σ of 9.6 counts at Ba I 553.55 nm, against a 12 000-count Na peak.
    {
      ...call("Ba I", "absent", [], 0.02),
      detectionLimit: {
        lineNm: 553.548,
        principal: true,
        noiseCounts: 9.6,
        counts: 48,
        relativeToStrongest: 0.004,
      },
    },
  ];
  return {
    id: "0f3c9a12-4b5d-4e6f-8a7b-1c2d3e4f5a6b",
    notebookId: "11111111-2222-4333-8444-555555555555",
    spectrumId: "22222222-3333-4444-8555-666666666666",
    calibrationId: "33333333-4444-4555-8666-777777777777",
    lineReleaseId: "44444444-5555-4666-8777-888888888888",
    lineReleaseNumber: 3,
    source: "flame",
    status: "draft",
    versionNumber: 1,
    amendsRunId: null,
    rerunOfId: null,
    createdById: null,
    notes: "",
    reviewRound: 0,
    requestedReviewerId: null,
    submittedAt: null,
    signedAt: null,
    lockVersion: 0,
    settings: {},
    lampChecked: true,
    softwareVersion: "0.1.0",
    rangeNm: [400, 800],
    noiseCounts: 3.2,
    warnings: [],
    peaks: [
      {
        x: 100,
        wavelengthNm: 589.001,
        uncertaintyNm: 0.004,
        fwhmNm: 1.02,
        height: 5200,
        snr: 410,
        saturated: false,
        blended: true,
      },
      {
        x: 101,
        wavelengthNm: 589.588,
        uncertaintyNm: 0.005,
        fwhmNm: 1.01,
        height: 2600,
        snr: 205,
        saturated: false,
        blended: true,
      },
      {
        x: 300,
        wavelengthNm: 766.52,
        uncertaintyNm: 0.01,
        fwhmNm: 1.1,
        height: 90,
        snr: 9,
        saturated: false,
        blended: false,
      },
      {
        x: 350,
        wavelengthNm: 701.2,
        uncertaintyNm: 0.02,
        fwhmNm: 1.0,
        height: 40,
        snr: 6,
        saturated: false,
        blended: false,
      },
    ],
    calls,
    verdicts: { "Na I": "present", "K I": "possible", "Ba I": "absent" },
    overrides: [],
    temperature: null,
    unexplained: [
      { wavelengthNm: 701.2, height: 40, snr: 6, reason: "no line of the release within 3σ" },
    ],
    createdAt: "2026-03-01T10:15:00.000Z",
    ...overrides,
  };
}

export const sampleMatches: StoredPeakMatch[] = [
  {
    peakIndex: 0,
    candidates: [
      {
        lineId: "line-na-d2",
        species: "Na I",
        kind: "atomic",
        referenceNm: NA_D2,
        deltaNm: 0.006,
        sigmaNm: 0.01,
        deltaSigma: 0.6,
      },
      {
        lineId: "line-ba",
        species: "Ba I",
        kind: "atomic",
        referenceNm: 588.99,
        deltaNm: 0.011,
        sigmaNm: 0.01,
        deltaSigma: 1.1,
      },
    ],
  },
  {
    peakIndex: 1,
    candidates: [
      {
        lineId: "line-na-d1",
        species: "Na I",
        kind: "atomic",
        referenceNm: NA_D1,
        deltaNm: -0.004,
        sigmaNm: 0.01,
        deltaSigma: -0.4,
      },
    ],
  },
  {
    peakIndex: 2,
    candidates: [
      {
        lineId: "line-k",
        species: "K I",
        kind: "atomic",
        referenceNm: K_LINE,
        deltaNm: 0.03,
        sigmaNm: 0.02,
        deltaSigma: 1.5,
      },
    ],
  },
];

export function sampleCalibration(): CalibrationRecord {
  return {
    id: "33333333-4444-4555-8666-777777777777",
    label: "Hg+Ar · 09:00 · polynomial-3 · RMS 0.012 nm · 405–812 nm",
    instrumentId: "55555555-6666-4777-8888-999999999999",
    spectrumId: "66666666-7777-4888-8999-aaaaaaaaaaaa",
    lineReleaseId: "44444444-5555-4666-8777-888888888888",
    lamps: ["Hg", "Ar"],
    requestedModel: "auto",
    model: "polynomial-3",
    rmsNm: 0.0123,
    dof: 8,
    pairs: [],
    rejected: [],
    coveredRangeNm: [404.66, 811.53],
    uncertainty: { medianNm: 0.004, maxNm: 0.01 },
    drift: null,
    pairing: { status: "ok", confidence: 0.9, message: "", manualSeeds: 0 },
    warnings: [],
    softwareVersion: "0.1.0",
    calibratedOn: "2026-03-01",
    createdAt: "2026-03-01T09:00:00.000Z",
  };
}

export function sampleInput(
  run: RunRecord = sampleRun(),
  extra: Partial<RunReportInput> = {},
): RunReportInput {
  return {
    run,
    calibration: sampleCalibration(),
    release: { id: run.lineReleaseId, number: 3, publishedAt: "2026-02-20T08:00:00.000Z" },
    spectrum: {
      id: run.spectrumId,
      fileName: "flame-sample.csv",
      label: "Flame sample",
      sha256: "ab".repeat(32),
      points: 2048,
    },
    instrument: { name: "Grating bench", dispersion: "grating" },
    notebook: { id: run.notebookId, title: "Salt screening" },
    authorName: "Chris Chemist",
    signature: null,
    rounds: [],
    generatedAt: "2026-03-02T12:00:00.000Z",
    ...extra,
  };
}
