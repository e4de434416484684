// The whole identification of one sample spectrum: prepare the signal, find peaks, put them on the
// calibrated axis with the instrument's line width at each, match them to the line table and
// score the species.
import type { CalibrationModel, CalibrationWarning } from "../calibration/calibration-model";
import { calibrationRangeWarnings } from "../calibration/calibration-range-warnings";
import { dispersionAt } from "../calibration/dispersion-at";
import { evaluateCalibration } from "../calibration/evaluate-calibration";
import { inverseOfModel } from "../calibration/inverse-of-model";
import { identifyElements, type ElementIdentification } from "../matching/identify-elements";
import { lowerBound } from "../matching/lower-bound";
import { prepareLineIndex, type LineIndex } from "../matching/prepare-line-index";
import { pickPeaks, type PickPeaksOptions } from "../peaks/pick-peaks";
import { binSamples } from "../signal/bin-samples";
import { binningFactorFor } from "../signal/binning-factor-for";
import { prepareSignal } from "../signal/prepare-signal";
import { smoothingWindowFor } from "../signal/smoothing-window-for";
import type { CalibratedPeak, Peak, ReferenceLine, SourceKind } from "../types";
import { calibratePeaks } from "./calibrate-peaks";
import {
  estimateInstrumentFwhm,
  type EstimateInstrumentFwhmOptions,
} from "./estimate-instrument-fwhm";
import {
  estimateInstrumentFwhmTrend,
  type EstimateInstrumentFwhmTrendOptions,
} from "./estimate-instrument-fwhm-trend";
import { detectionLimits, type DetectionLimit } from "./detection-limits";
import { excitationTemperature, type ExcitationTemperature } from "./excitation-temperature";
import { lteLineIndex } from "./lte-line-index";
import { SAMPLE_ANALYSIS_DEFAULTS } from "./sample-analysis-defaults";
import { assertPositiveFinite } from "../units/assert-positive-finite";

export interface AnalyzeSampleOptions {
  /** The dispersion relation for the input axis; null when x already is a wavelength axis in nm.
   * @default null */
  calibration?: CalibrationModel | null;
  /** Kind of source; chooses the continuum method and the expected relative intensities.
   * @default "flame" */
  source?: SourceKind;
  /** Instrument resolution (FWHM) in nm; on a calibrated pixel axis it is taken as the resolution
   * at the middle of the array and turned into resolutionPx there (see resolutionPx).
   * @default estimated (see resolutionPx) */
  resolutionNm?: number;
  /** The instrument's disperser. A grating's resolution is about constant in nm. A prism's slit
   * image is about constant in pixels while its dispersion changes several-fold across the array,
   * so its one resolutionNm (its FWHM near the middle) serves only a calibrated pixel axis, through
   * the dispersion there; on an axis used as it is (no pixel layout known) a prism's resolutionNm
   * is not used, nor is it when the calibration's dispersion at the middle is not usable: the width
   * is then read from the peaks (see resolutionPx).
   * @default "grating" */
  dispersion?: "grating" | "prism";
  /** Instrument line-profile FWHM in pixels (the slit image, about constant across the array),
   * for a calibrated pixel axis only. Each peak then gets the resolution in nm at its own
   * wavelength (this × |dλ/dx| there) for the matching tolerance, and peaks wider than
   * broadFactor times it are flagged broad and offered only molecular bands.
   * @default resolutionNm / |dλ/dx| at the middle of the array when resolutionNm is given, else
   * the median FWHM of the sample's clearest peaks (see estimateInstrumentFwhm); on an axis in nm
   * without resolutionNm, the power law of the clean peaks' widths along it (see resolutionTrend) */
  resolutionPx?: number;
  /** A peak wider than this many instrument FWHM (and not saturated) is flagged broad.
   * @default 3 */
  broadFactor?: number;
  /** Settings of the estimate of resolutionPx from the sample's own peaks. */
  resolutionEstimate?: EstimateInstrumentFwhmOptions;
  /** Settings of the width trend read from the sample's peaks on an axis in nm (see resolutionNm). */
  resolutionTrend?: EstimateInstrumentFwhmTrendOptions;
  /** Detector maximum in counts, to flag saturated peaks.
   * @default undefined (flat tops at the array's maximum) */
  detectorMax?: number;
  /** Lowest signal-to-noise ratio of a reported peak.
   * @default 5 */
  minSnr?: number;
  /** Half-width of the matching window in combined standard deviations.
   * @default 3 */
  k?: number;
  /** Further peak-picking settings. */
  peakOptions?: Omit<PickPeaksOptions, "minSnr">;
  /** Excitation temperature in K the chemist assumes: where the table has g, A and upper-level
   * energy for a species' lines, its expected relative intensities for `source` are the LTE
   * prediction at this temperature instead of the table's values (see lteReferenceLines).
   * @default undefined (the table's relative intensities) */
  lteTemperatureK?: number;
}

export interface SampleAnalysis {
  peaks: CalibratedPeak[];
  identification: ElementIdentification;
  /** Calibrated wavelength range covered by the spectrum, in nm. */
  rangeNm: [number, number];
  /** Robust noise estimate of the raw counts over the whole array (peaks' SNRs use the local
   * noise instead where it grows with the continuum; see prepareSignal's noiseProfile). */
  noiseCounts: number;
  /** Extrapolation and axis warnings for the chemist. */
  warnings: CalibrationWarning[];
  /** True when the axis was used without a lamp calibration. */
  lampChecked: boolean;
  /** The instrument line width the analysis used, and where it came from; null when none was
   * known (the matching then falls back on each peak's own FWHM and nothing is flagged broad). */
  instrumentWidth: InstrumentWidth | null;
  /** The continuum that was removed before peak finding, one value per input sample (interpolated
   * back from the binned samples when the input was binned). */
  continuum: Float64Array;
  /** Samples averaged into one before peak finding (1: none). */
  binningFactor: number;
  /** The Boltzmann excitation temperature of the species called present with the most usable
   * lines, or why there is none. */
  temperature: ExcitationTemperature;
  /** For each species called absent with a rated line in range: the least height its strongest
   * line there needed to be found (see detectionLimits), by species. */
  detectionLimits: Record<string, DetectionLimit>;
}

/** The instrument's line-profile FWHM used by an analysis. */
export interface InstrumentWidth {
  /** FWHM on the input axis: pixels when lamp-calibrated, nm on an axis used as it is. */
  fwhm: number;
  unit: "px" | "nm";
  /** Given as resolutionPx, converted from resolutionNm, or estimated from the sample's peaks. */
  basis: "resolutionPx" | "resolutionNm" | "estimated";
  /** On an axis in nm with no stated resolution, the width varies as fwhm · (x / referenceX)^exponent
   * (estimated from the clean peaks; near 0 for a grating, about 3 for a prism); absent: constant. */
  trend?: { referenceX: number; exponent: number };
}

/** Samples kept clear of each end when the instrument's width is not known. */
const EDGE_SAMPLES = 3;

/**
 * The part of the range where a line would show as a peak: one instrument FWHM (else EDGE_SAMPLES
 * samples) in from each end of the array. A line closer to an end than that has part of its profile
 * off the detector and no top the peak finder can take (Cs I 852.11 nm 0.1 nm inside a range ending
 * at 852.2 nm was "missing though expected at SNR 1264", and Cs absent). The full range when the
 * array is too short to keep anything.
 */
function judgedRange(
  x: Float64Array,
  calibration: CalibrationModel | null,
  width: InstrumentWidth | null,
  rangeNm: [number, number],
): [number, number] {
  const n = x.length;
  if (n < 2) return rangeNm;
  const inward = Math.sign(x[n - 1] - x[0]);
  const margin = (at: number, step: number) =>
    width ? instrumentWidthAt(width, x[at]) : EDGE_SAMPLES * Math.abs(step);
  const inside = Float64Array.of(
    x[0] + inward * margin(0, x[1] - x[0]),
    x[n - 1] - inward * margin(n - 1, x[n - 1] - x[n - 2]),
  );
  const insideNm = calibration ? evaluateCalibration(calibration, inside) : inside;
  const low = Math.max(rangeNm[0], Math.min(insideNm[0], insideNm[1]));
  const high = Math.min(rangeNm[1], Math.max(insideNm[0], insideNm[1]));
  return low < high && Number.isFinite(low) && Number.isFinite(high) ? [low, high] : rangeNm;
}

/** The instrument FWHM at x on the input axis. */
export function instrumentWidthAt(width: InstrumentWidth, x: number): number {
  return width.trend
    ? width.fwhm * (x / width.trend.referenceX) ** width.trend.exponent
    : width.fwhm;
}

/** Accepts the line table as rows or as an index prepared once and reused across analyses. */
export function analyzeSample(
  x: Float64Array,
  y: Float64Array,
  lines: readonly ReferenceLine[] | LineIndex,
  options: AnalyzeSampleOptions = {},
): SampleAnalysis {
  const {
    calibration = null,
    source = "flame",
    resolutionNm,
    resolutionPx,
    broadFactor,
    detectorMax,
    minSnr = SAMPLE_ANALYSIS_DEFAULTS.minSnr,
    k = SAMPLE_ANALYSIS_DEFAULTS.k,
  } = options;
  for (const [name, value] of Object.entries({ resolutionNm, resolutionPx })) {
    if (value !== undefined) assertPositiveFinite(value, name);
  }
  if (resolutionPx !== undefined && !calibration) {
    throw new RangeError(
      "resolutionPx needs a calibrated pixel axis; give resolutionNm for an axis already in nm",
    );
  }
  const { lteTemperatureK } = options;
  if (lteTemperatureK !== undefined) assertPositiveFinite(lteTemperatureK, "lteTemperatureK");
  if (x.length !== y.length)
    throw new RangeError(`x and y differ in length (${x.length} vs ${y.length})`);
  // A heavily oversampled array (a line thousands of samples wide) is averaged down to a few samples
  // per line first, as calibrateLamp does: the smoothing window and the peak finder expect lines a
  // few samples wide. Peak centres and widths stay on the input axis (binSamples keeps mean x).
  const stated = statedInstrumentWidth(x, calibration, options);
  const lineSamples = x.length > 1 ? lineWidthInSamples(x, stated) : Number.NaN;
  const binningFactor = x.length > 1 ? binningFactorFor(lineSamples) : 1;
  const binned = binningFactor > 1 ? binSamples(x, y, { factor: binningFactor }) : { x, y };
  const signal = prepareSignal(binned.x, binned.y, {
    source,
    detectorMax,
    smoothing: { windowSize: smoothingWindowFor(lineSamples / binningFactor), polynomial: 4 },
  });
  const picked = pickPeaks(binned.x, signal, { ...options.peakOptions, minSnr });
  const instrumentWidth = stated ?? estimatedInstrumentWidth(picked, calibration, options);
  const peaks = calibratePeaks(picked, {
    calibration,
    instrumentFwhm: instrumentWidth?.trend
      ? (at) => instrumentWidthAt(instrumentWidth, at)
      : instrumentWidth?.fwhm,
    broadFactor,
  });
  const ends = Float64Array.of(x[0], x[x.length - 1]);
  const endsNm = calibration ? evaluateCalibration(calibration, ends) : ends;
  const rangeNm: [number, number] = [
    Math.min(endsNm[0], endsNm[1]),
    Math.max(endsNm[0], endsNm[1]),
  ];
  const judgedRangeNm = judgedRange(x, calibration, instrumentWidth, rangeNm);
  let index = Array.isArray(lines)
    ? prepareLineIndex(lines as readonly ReferenceLine[])
    : (lines as LineIndex);
  if (lteTemperatureK !== undefined) {
    index = lteLineIndex(index, source, lteTemperatureK);
  }
  const identification = identifyElements(peaks, index, {
    k,
    resolutionNm: stated?.basis === "resolutionNm" ? resolutionNm : undefined,
    source,
    rangeNm,
    judgedRangeNm,
    // With a noise profile each peak's snr already holds its local noise; one global σ would undo that.
    noiseCounts: signal.noiseProfile ? undefined : signal.noise,
  });
  const warnings: CalibrationWarning[] = calibration
    ? calibrationRangeWarnings(calibration, ends)
    : [];
  const continuum =
    binningFactor > 1 ? interpolateOnto(binned.x, signal.continuum, x) : signal.continuum;
  const temperature = excitationTemperature(identification.calls, peaks);
  // The input x of a wavelength: through the calibration's inverse (NaN where it does not reach).
  const xOfNm = calibration
    ? inverseOfModel(calibration, [x[0], x[x.length - 1]])
    : (nm: number) => nm;
  const limits = detectionLimits(identification.calls, {
    index,
    source,
    rangeNm: judgedRangeNm,
    noiseAtNm: (nm) => {
      const i = nearestSample(binned.x, xOfNm(nm));
      return i < 0 ? Number.NaN : signal.noiseProfile ? signal.noiseProfile[i] : signal.noise;
    },
    minSnr,
    tallestHeight: peaks.reduce((h, p) => Math.max(h, p.height), 0),
  });
  return {
    peaks,
    identification,
    rangeNm,
    noiseCounts: signal.noise,
    warnings,
    lampChecked: Boolean(calibration),
    instrumentWidth,
    continuum,
    binningFactor,
    temperature,
    detectionLimits: Object.fromEntries(limits),
  };
}

/** Index of the sample of increasing `axis` nearest `at`, or −1 when `at` lies outside it. */
function nearestSample(axis: Float64Array, at: number): number {
  const n = axis.length;
  if (!(at >= axis[0] && at <= axis[n - 1])) return -1;
  const i = lowerBound(axis, at);
  return i > 0 && at - axis[i - 1] <= axis[i] - at ? i - 1 : i;
}

/**
 * How many input samples one instrument line spans: from the stated width when there is one, else
 * (like calibrateLamp) a line a 500th of the array wide, the order of a small spectrometer's
 * resolving power over its range (common practice).
 */
function lineWidthInSamples(x: Float64Array, stated: InstrumentWidth | null): number {
  const step = Math.abs(x[x.length - 1] - x[0]) / (x.length - 1);
  return stated ? stated.fwhm / step : (x.length - 1) / 500;
}

/** Linear interpolation of (fromX, fromY), fromX ascending, at each of `at` (held flat past the ends). */
function interpolateOnto(fromX: Float64Array, fromY: Float64Array, at: Float64Array): Float64Array {
  const out = new Float64Array(at.length);
  let j = 0;
  for (let i = 0; i < at.length; i++) {
    const v = at[i];
    if (v <= fromX[0]) {
      out[i] = fromY[0];
      continue;
    }
    if (v >= fromX[fromX.length - 1]) {
      out[i] = fromY[fromY.length - 1];
      continue;
    }
    while (fromX[j + 1] < v) j++;
    const t = (v - fromX[j]) / (fromX[j + 1] - fromX[j]);
    out[i] = fromY[j] + t * (fromY[j + 1] - fromY[j]);
  }
  return out;
}

/**
 * The instrument's width from what the caller states, the one place it is worked out: resolutionPx
 * as given; else resolutionNm over the dispersion at the array's middle (a grating's is nearly
 * constant; for a prism the chemist's one number is best read as its middle); without a
 * calibration, a grating's resolutionNm as it is. Null when nothing usable is stated (a prism's
 * resolutionNm on an axis used as it is, or where its calibration's dispersion at the middle is
 * not usable): the width is then estimated from the peaks.
 */
function statedInstrumentWidth(
  x: Float64Array,
  calibration: CalibrationModel | null,
  options: AnalyzeSampleOptions,
): InstrumentWidth | null {
  const { resolutionNm, resolutionPx, dispersion = "grating" } = options;
  if (calibration && resolutionPx !== undefined)
    return { fwhm: resolutionPx, unit: "px", basis: "resolutionPx" };
  if (resolutionNm === undefined) return null;
  if (!calibration) {
    return dispersion === "prism"
      ? null
      : { fwhm: resolutionNm, unit: "nm", basis: "resolutionNm" };
  }
  const middle = Float64Array.of(0.5 * (x[0] + x[x.length - 1]));
  const slope = Math.abs(dispersionAt(calibration, middle)[0]);
  if (slope > 0 && Number.isFinite(slope))
    return { fwhm: resolutionNm / slope, unit: "px", basis: "resolutionNm" };
  if (dispersion === "prism") return null;
  throw new RangeError(
    `the calibration's dispersion at the array's middle is not usable (${slope} nm per pixel)`,
  );
}

/**
 * Without a stated width: the median width of the clearest peaks on a calibrated axis; on an axis
 * in nm, the power law the clean peaks' widths follow along it (estimateInstrumentFwhmTrend): a
 * prism's width in nm grows several-fold to the red, so no one number serves it.
 */
function estimatedInstrumentWidth(
  peaks: Peak[],
  calibration: CalibrationModel | null,
  options: AnalyzeSampleOptions,
): InstrumentWidth | null {
  if (!calibration) {
    const trend = estimateInstrumentFwhmTrend(peaks, options.resolutionTrend);
    return trend === null
      ? null
      : {
          fwhm: trend.fwhm,
          unit: "nm",
          basis: "estimated",
          trend: { referenceX: trend.referenceX, exponent: trend.exponent },
        };
  }
  const estimated = estimateInstrumentFwhm(peaks, options.resolutionEstimate);
  return estimated === null ? null : { fwhm: estimated, unit: "px", basis: "estimated" };
}
