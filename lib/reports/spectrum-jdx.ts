// A run's calibrated sample spectrum as JCAMP-DX through the project's own writer, with the run,
// calibration and line-table release named in user-defined (##$) labels so the file says where it came
// from: as calibrated (an uneven axis is written point by point), or resampled onto an even axis for
// programs that take only evenly spaced (compressed XYDATA) spectra.
import { formatJcampDx, resampleEvenly } from "@/lib/spectrum/io";
import type { WavelengthMedium } from "@/lib/spectrum/types";
import { SCREENING_CAVEAT } from "./report-text";

export interface RunSpectrumJdxInput {
  wavelengthNm: Float64Array;
  counts: Float64Array;
  /** The medium of the wavelengths, or null when the file did not say. */
  medium: WavelengthMedium | null;
  runId: string;
  versionNumber: number;
  calibrationId: string | null;
  releaseId: string;
  releaseNumber: number | null;
  sampleSha256: string;
  sampleFileName: string;
  softwareVersion: string;
  /** ##ORIGIN: the team that made the run. */
  origin: string;
  /** When the run was analysed (ISO 8601): ##DATE, ##TIME and ##LONGDATE. */
  analysedAt: string;
}

export interface FormatRunSpectrumJdxOptions {
  /**
   * Resample onto an even axis of as many points (linear interpolation) and write compressed XYDATA.
   * @default false
   */
  resampleEvenly?: boolean;
}

export function formatRunSpectrumJdx(
  input: RunSpectrumJdxInput,
  options: FormatRunSpectrumJdxOptions = {},
): string {
  const { resampleEvenly: resample = false } = options;
  const calibrated = {
    x: input.wavelengthNm,
    y: input.counts,
    xUnit: "nm" as const,
    medium: input.medium ?? undefined,
    meta: {},
  };
  const spectrum = resample ? resampleEvenly(calibrated) : calibrated;
  const mediumWords = input.medium === null ? "medium not stated" : `${input.medium} wavelengths`;
  const shortId = input.runId.replace(/-/g, "").slice(0, 8);
  const what = resample ? "evenly resampled spectrum" : "calibrated sample spectrum";
  const userLabels = [
    { name: "$EMBERLINE RUN ID", value: input.runId },
    { name: "$EMBERLINE RUN VERSION", value: String(input.versionNumber) },
    {
      name: "$EMBERLINE CALIBRATION ID",
      value: input.calibrationId ?? "NONE (the file's own wavelength axis)",
    },
    { name: "$EMBERLINE LINE RELEASE ID", value: input.releaseId },
    { name: "$EMBERLINE LINE RELEASE NUMBER", value: String(input.releaseNumber ?? "NONE") },
    { name: "$EMBERLINE SAMPLE FILE", value: input.sampleFileName },
    // A short name: "##$" + name + "=" + 64 hex digits must stay within the 80 characters of a line.
    { name: "$RAW SHA256", value: input.sampleSha256 },
    { name: "$EMBERLINE SOFTWARE VERSION", value: input.softwareVersion },
    ...(input.medium === null ? [{ name: "$MEDIUM", value: "NOT STATED" }] : []),
    ...(resample
      ? [
          {
            name: "$EMBERLINE RESAMPLED",
            value: `LINEAR INTERPOLATION ONTO ${spectrum.x.length} EVEN STEPS`,
          },
        ]
      : []),
  ];
  const comments = [
    SCREENING_CAVEAT,
    "RAW SHA256 is the SHA-256 of the sample file as uploaded.",
    ...(resample
      ? [
          "The calibrated points were linearly interpolated onto evenly spaced wavelengths; a narrow peak loses a little height. The calibrated points themselves are in the other JCAMP-DX export (spectrum.jdx).",
        ]
      : []),
  ];
  return formatJcampDx(spectrum, {
    title: `Emberline run ${shortId} v${input.versionNumber}: ${what} (${mediumWords})`,
    origin: input.origin,
    owner: input.origin,
    date: input.analysedAt,
    yUnits: "ARBITRARY UNITS",
    // Interpolated counts are worth a thousandth of a count at most (counts themselves are integers).
    yResolution: resample ? 0.001 : undefined,
    userLabels,
    comments,
  });
}
