// The whole identification of one sample spectrum: prepare the signal, find peaks, put them on the
// calibrated axis, match them to the line table and score the species.
import type { CalibrationModel, CalibrationWarning } from "../calibration/calibration-model";
import { calibrationRangeWarnings } from "../calibration/calibration-range-warnings";
import { evaluateCalibration } from "../calibration/evaluate-calibration";
import { identifyElements, type ElementIdentification } from "../matching/identify-elements";
import { prepareLineIndex, type LineIndex } from "../matching/prepare-line-index";
import { pickPeaks, type PickPeaksOptions } from "../peaks/pick-peaks";
import { prepareSignal } from "../signal/prepare-signal";
import type { CalibratedPeak, ReferenceLine, SourceKind } from "../types";
import { calibratePeaks } from "./calibrate-peaks";

export interface AnalyzeSampleOptions {
  /** The dispersion relation for the input axis; null when x already is a wavelength axis in nm.
   * @default null */
  calibration?: CalibrationModel | null;
  /** Kind of source; chooses the continuum method and the expected relative intensities.
   * @default "flame" */
  source?: SourceKind;
  /** Instrument resolution (FWHM) in nm, for the matching tolerance.
   * @default each peak's own FWHM */
  resolutionNm?: number;
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
}

export interface SampleAnalysis {
  peaks: CalibratedPeak[];
  identification: ElementIdentification;
  /** Calibrated wavelength range covered by the spectrum, in nm. */
  rangeNm: [number, number];
  /** Robust noise estimate of the raw counts. */
  noiseCounts: number;
  /** Extrapolation and axis warnings for the chemist. */
  warnings: CalibrationWarning[];
  /** True when the axis was used without a lamp calibration. */
  lampChecked: boolean;
}

/** Accepts the line table as rows or as an index prepared once and reused across analyses. */
export function analyzeSample(
  x: Float64Array,
  y: Float64Array,
  lines: readonly ReferenceLine[] | LineIndex,
  options: AnalyzeSampleOptions = {},
): SampleAnalysis {
  const { calibration = null, source = "flame", resolutionNm, detectorMax, minSnr = 5, k = 3 } = options;
  const signal = prepareSignal(x, y, { source, detectorMax });
  const peaks = calibratePeaks(pickPeaks(x, signal, { ...options.peakOptions, minSnr }), { calibration });
  const ends = Float64Array.of(x[0], x[x.length - 1]);
  const endsNm = calibration ? evaluateCalibration(calibration, ends) : ends;
  const rangeNm: [number, number] = [Math.min(endsNm[0], endsNm[1]), Math.max(endsNm[0], endsNm[1])];
  const index = Array.isArray(lines) ? prepareLineIndex(lines as readonly ReferenceLine[]) : (lines as LineIndex);
  const identification = identifyElements(peaks, index, {
    k,
    resolutionNm,
    source,
    rangeNm,
    noiseCounts: signal.noise,
  });
  const warnings: CalibrationWarning[] = calibration ? calibrationRangeWarnings(calibration, ends) : [];
  return { peaks, identification, rangeNm, noiseCounts: signal.noise, warnings, lampChecked: Boolean(calibration) };
}
