// From a lamp spectrum to a wavelength calibration: find the lamp's peaks, pair them with the
// lamp lines automatically, and fit the chosen (or the default) dispersion relation.
import { autoPairLampPeaks } from "../calibration/auto-pair-lamp-peaks";
import { CalibrationError } from "../calibration/calibration-error";
import type { CalibrationModel, CalibrationModelKind } from "../calibration/calibration-model";
import { fitCalibration, type FitCalibrationResult } from "../calibration/fit-calibration";
import type { LampLine, LampPairingResult } from "../calibration/lamp-pairing-types";
import { findPeaks } from "../peaks/find-peaks";
import { binSamples } from "../signal/bin-samples";
import { binningFactorFor } from "../signal/binning-factor-for";
import { removeSpikes } from "../signal/remove-spikes";
import type { DispersionKind, Peak } from "../types";

/** Lines narrower than this many samples (FWHM) could pass for hot pixels, which are then left alone. */
const MIN_SAMPLES_PER_LINE_TO_DESPIKE = 2;

/** Fewest samples of a lamp spectrum (the peak finder's smoothing needs this many). */
const MIN_SAMPLES = 16;

export interface CalibrateLampOptions {
  /** The instrument's nominal wavelength range in nm. */
  nominalRangeNm: [number, number];
  /** Prism or grating: chooses the pairing's first guess and the default model. */
  dispersion: DispersionKind;
  /** Instrument resolution (FWHM) in nm.
   * @default nominal span / 500 */
  resolutionNm?: number;
  /** Model to fit after pairing; "auto" keeps the pairing's own fit.
   * @default "auto" */
  model?: "auto" | { kind: CalibrationModelKind; degree?: number };
  /** Lowest signal-to-noise ratio of a lamp peak.
   * @default 8 */
  minSnr?: number;
  /** The instrument's previous calibration: pairing starts from it (shift, stretch), the blind search is the fallback. */
  previous?: CalibrationModel;
  /** Seed of the pairing's random draws.
   * @default 1 */
  seed?: number;
  /** The blind search (see AutoPairLampPeaksOptions.search).
   * @default "grow" for a grating, with the draws as a second opinion; for a prism "ransac", with growth as a second opinion */
  search?: "grow" | "ransac";
}

export interface LampCalibration {
  peaks: Peak[];
  pairing: LampPairingResult;
  /** The fit, or null when pairing needs manual help. */
  fit: FitCalibrationResult | null;
}

/** Throws CalibrationError("invalid-input") with a sentence a chemist understands when the input cannot be calibrated. */
function checkInput(
  x: Float64Array,
  y: Float64Array,
  lines: LampLine[],
  options: CalibrateLampOptions,
): void {
  const invalid = (message: string, details: Record<string, unknown> = {}) =>
    new CalibrationError("invalid-input", message, details);
  if (!(x instanceof Float64Array) || !(y instanceof Float64Array) || x.length !== y.length) {
    throw invalid(
      "the lamp spectrum must have one count per pixel (the two columns differ in length)",
    );
  }
  if (x.length < MIN_SAMPLES)
    throw invalid(`the lamp spectrum has ${x.length} samples; at least ${MIN_SAMPLES} are needed`);
  for (let i = 0; i < x.length; i++) {
    if (!Number.isFinite(x[i]) || !Number.isFinite(y[i]))
      throw invalid(`the lamp spectrum has a missing or non-numeric value at sample ${i + 1}`);
    if (i > 0 && !(x[i] > x[i - 1]))
      throw invalid(
        `the lamp spectrum's first column must increase from sample to sample (sample ${i + 1} does not)`,
      );
  }
  const range = options?.nominalRangeNm;
  if (
    !Array.isArray(range) ||
    range.length !== 2 ||
    !(Number.isFinite(range[0]) && Number.isFinite(range[1]) && range[0] > 0 && range[0] < range[1])
  ) {
    throw invalid(
      "the instrument's nominal range must be two positive wavelengths, the lower first",
    );
  }
  if (options.dispersion !== "grating" && options.dispersion !== "prism")
    throw invalid('the instrument must be a "grating" or a "prism"');
  if (
    options.resolutionNm !== undefined &&
    !(Number.isFinite(options.resolutionNm) && options.resolutionNm > 0)
  ) {
    throw invalid("the instrument's resolution must be a positive number of nm");
  }
  if (
    !Array.isArray(lines) ||
    lines.some(
      (l) =>
        !(Number.isFinite(l?.wavelengthNm) && l.wavelengthNm > 0 && Number.isFinite(l.intensity)),
    )
  ) {
    throw invalid("every lamp line needs a positive wavelength and a numeric intensity");
  }
}

export function calibrateLamp(
  x: Float64Array,
  y: Float64Array,
  lines: LampLine[],
  options: CalibrateLampOptions,
): LampCalibration {
  checkInput(x, y, lines, options);
  try {
    return calibrateCheckedLamp(x, y, lines, options);
  } catch (error) {
    if (error instanceof CalibrationError) throw error;
    // Whatever else fails inside (a degenerate fit, a numerical corner) is still a calibration that
    // could not be made from this lamp: the caller gets the typed error it maps to a 4xx, with the cause.
    const reason = error instanceof Error ? error.message : String(error);
    throw new CalibrationError(
      "fit-failed",
      `the lamp spectrum could not be calibrated automatically (${reason}); pair a few peaks by hand`,
      {
        cause: error instanceof Error ? error.name : typeof error,
      },
    );
  }
}

function calibrateCheckedLamp(
  x: Float64Array,
  y: Float64Array,
  lines: LampLine[],
  options: CalibrateLampOptions,
): LampCalibration {
  const { model = "auto", minSnr = 8, seed = 1 } = options;
  // A heavily oversampled array (a line thousands of samples wide) is averaged down to a few samples
  // per line first: the smoothing window is sized for lines a few samples wide.
  const spanNm = Math.abs(options.nominalRangeNm[1] - options.nominalRangeNm[0]);
  const resolutionNm = options.resolutionNm ?? spanNm / 500;
  const samplesPerLine = resolutionNm / (spanNm / (x.length - 1));
  const factor = binningFactorFor(samplesPerLine);
  // Hot pixels go first, while they are still one sample wide (binning or smoothing would widen them
  // into line-like peaks); only where lines span two samples or more, so no line can be taken for one.
  const despiked = samplesPerLine >= MIN_SAMPLES_PER_LINE_TO_DESPIKE ? removeSpikes(y).y : y;
  const binned = binSamples(x, despiked, { factor });
  const peaks = withEdgeUncertainty(
    findPeaks(binned.x, binned.y, { source: "lamp", minSnr }),
    binned.x,
  );
  const domain: [number, number] = [x[0], x[x.length - 1]];
  const pairing = autoPairLampPeaks(peaks, lines, {
    nominalRangeNm: options.nominalRangeNm,
    dispersion: options.dispersion,
    resolutionNm: options.resolutionNm,
    domain,
    seed,
    ...(options.previous ? { previous: options.previous } : {}),
    ...(options.search ? { search: options.search } : {}),
  });
  if (pairing.status !== "paired") return { peaks, pairing, fit: null };
  const fit =
    model === "auto"
      ? pairing.model
      : fitCalibration(pairing.pairs, { model: model.kind, degree: model.degree, domain });
  return { peaks, pairing, fit };
}

/**
 * A line whose centre lies within one FWHM of the array's end has part of its profile off the
 * detector: the peak finder's centre for it is pulled towards the inside by up to about a FWHM, and a
 * fit that believes its noise-limited σ follows it (a Kr I 645.63 nm pair 3 pixels from the end of a
 * 2048-pixel prism array sat 0.29 nm off, and the physical prism model bent 0.29 nm with it). Such a
 * peak's centre uncertainty is raised to its FWHM, so the fits weigh it for what it is.
 */
function withEdgeUncertainty(peaks: Peak[], x: Float64Array): Peak[] {
  const [first, last] = [x[0], x[x.length - 1]];
  return peaks.map((peak) =>
    Math.min(peak.x - first, last - peak.x) < peak.fwhm
      ? { ...peak, xUncertainty: Math.max(peak.xUncertainty, peak.fwhm) }
      : peak,
  );
}
