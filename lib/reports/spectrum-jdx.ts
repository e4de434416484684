// A run's calibrated sample spectrum as JCAMP-DX through the project's own writer, with the run,
// calibration and line-table release named in user-defined (##$) labels so the file says where it came from.
import { formatJcampDx } from "@/lib/spectrum/io";
import type { WavelengthMedium } from "@/lib/spectrum/types";

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
  /** ##DATE: when the run was analysed (ISO 8601). */
  analysedAt: string;
}

export function formatRunSpectrumJdx(input: RunSpectrumJdxInput): string {
  const mediumWords = input.medium === null ? "medium not stated" : `${input.medium} wavelengths`;
  const text = formatJcampDx(
    {
      x: input.wavelengthNm,
      y: input.counts,
      xUnit: "nm",
      medium: input.medium ?? undefined,
      meta: {},
    },
    {
      title: `Emberline run ${input.runId} v${input.versionNumber}: calibrated sample spectrum (${mediumWords})`,
      origin: input.origin,
      owner: input.origin,
      date: input.analysedAt,
      yUnits: "COUNTS",
    },
  );
  const labels = [
    `##$EMBERLINE RUN ID=${input.runId}`,
    `##$EMBERLINE RUN VERSION=${input.versionNumber}`,
    `##$EMBERLINE CALIBRATION ID=${input.calibrationId ?? "NONE (the file's own wavelength axis)"}`,
    `##$EMBERLINE LINE RELEASE ID=${input.releaseId}`,
    `##$EMBERLINE LINE RELEASE NUMBER=${input.releaseNumber ?? "NONE"}`,
    `##$EMBERLINE SAMPLE FILE=${oneLine(input.sampleFileName)}`,
    `##$EMBERLINE SAMPLE SHA256=${input.sampleSha256}`,
    `##$EMBERLINE SOFTWARE VERSION=${input.softwareVersion}`,
    `##$WAVELENGTH MEDIUM=${input.medium === null ? "NOT STATED" : input.medium.toUpperCase()}`,
  ];
  // The writer puts ##XUNITS after the header labels; ours go just before it.
  const at = text.indexOf("\n##XUNITS=");
  return `${text.slice(0, at + 1)}${labels.join("\n")}\n${text.slice(at + 1)}`;
}

function oneLine(value: string): string {
  return value.replace(/[\r\n]+/g, " ");
}
