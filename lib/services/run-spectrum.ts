// A run's sample on the wavelength axis the run used: through its calibration, or (for a file with
// its own wavelength column and no calibration) the file's axis in nm, in air where the medium is
// known. The run page's chart and the report exports read it from here, so both show what the
// analysis saw.
import "server-only";
import type { Actor } from "@/lib/auth/actor";
import { thinSeries } from "@/lib/charts/thin-series";
import { sampleOnWavelengthAxis } from "@/lib/spectrum/analysis/sample-on-wavelength-axis";
import { spectrumToNanometres } from "@/lib/spectrum/units";
import { Calibration, type Run, type SpectrumFile } from "@/models";
import { bytesToFloat64 } from "./float64-bytes";
import { loadRun } from "./run-lifecycle";
import { loadSpectrum, spectrumPoints } from "./spectra";

/** The file's own axis in nm: in air when its medium is known (tables give lines in air above 200 nm). */
function fileAxisInNm(spectrum: SpectrumFile): { x: Float64Array; y: Float64Array } {
  const { x, y } = spectrumPoints(spectrum);
  if (spectrum.xUnit === "nm" || spectrum.xUnit === "pixel") return { x, y };
  const known = spectrum.xUnit === "wavenumber" || spectrum.medium !== null;
  const inNm = spectrumToNanometres(
    { x, y, xUnit: spectrum.xUnit, medium: spectrum.medium ?? undefined, meta: {} },
    known ? { medium: "air", belowRange: "unchanged" } : {},
  );
  return { x: inNm.x, y: inNm.y };
}

/**
 * The points a run's analysis reads: the sample on its own axis when a calibration maps it (the
 * analysis puts them on the calibrated axis), else the file's own axis in nm.
 */
export function analysedPoints(
  spectrum: SpectrumFile,
  calibrated: boolean,
): { x: Float64Array; y: Float64Array } {
  return calibrated ? spectrumPoints(spectrum) : fileAxisInNm(spectrum);
}

/** A chart's series: at most MAX_CHART_POINTS points (lib/charts/thin-series.ts), and how many the
 * stored series had. */
export interface ChartSeries {
  x: number[];
  y: number[];
  sourcePoints: number;
}

/** A stored spectrum's points on its own axis (previews of uploads and lamps), thinned for the chart. */
export async function fetchSpectrumSeries(actor: Actor, spectrumId: string): Promise<ChartSeries> {
  const { x, y } = spectrumPoints(await loadSpectrum(actor, spectrumId));
  const thin = thinSeries(x, y);
  return { x: thin.x, y: thin.y, sourcePoints: thin.sourcePoints };
}

export interface RunSpectrum {
  /** Ascending wavelengths in nm (air above 200 nm when lamp-calibrated or the medium is known). */
  wavelengthNm: Float64Array;
  counts: Float64Array;
  /** The continuum the analysis removed, on the same points; null for a run stored without one. */
  continuum: Float64Array | null;
  lampChecked: boolean;
}

/** The stored continuum (little-endian float64, one per analysed point); null when absent or of another length. */
function storedContinuum(bytes: Buffer | null, points: number): Float64Array | null {
  if (!bytes || bytes.length !== points * 8) return null;
  return bytesToFloat64(bytes);
}

/** A run's sample on the axis the run used, with the continuum it removed, thinned for the chart. */
export async function fetchRunSeries(
  actor: Actor,
  runId: string,
): Promise<{ spectrum: ChartSeries; continuum: number[] | null }> {
  const { wavelengthNm, counts, continuum } = await fetchRunSpectrum(actor, runId);
  const thin = thinSeries(wavelengthNm, counts, continuum ? { continuum } : {});
  return {
    spectrum: { x: thin.x, y: thin.y, sourcePoints: thin.sourcePoints },
    continuum: thin.companions.continuum ?? null,
  };
}

async function fetchRunSpectrum(actor: Actor, runId: string): Promise<RunSpectrum> {
  const run = await loadRun(actor, runId);
  const spectrum = await loadSpectrum(actor, run.spectrumId);
  // The chart needs only the calibration's model.
  const calibration = run.calibrationId
    ? (await Calibration.findByPk(run.calibrationId, { attributes: ["model"] }))!
    : null;
  return runSpectrumOf(run, spectrum, calibration);
}

/** The run's spectrum from rows already loaded (the report loads each row once). */
export function runSpectrumOf(
  run: Pick<Run, "continuum" | "lampChecked">,
  spectrum: SpectrumFile,
  calibration: Pick<Calibration, "model"> | null,
): RunSpectrum {
  const points = analysedPoints(spectrum, calibration !== null);
  const onAxis = sampleOnWavelengthAxis(
    { ...points, companion: storedContinuum(run.continuum, points.x.length) },
    calibration?.model ?? null,
  );
  return {
    wavelengthNm: onAxis.wavelengthNm,
    counts: onAxis.counts,
    continuum: onAxis.companion,
    lampChecked: run.lampChecked,
  };
}
