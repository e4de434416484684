// From a lamp spectrum to a wavelength calibration: find the lamp's peaks, pair them with the
// lamp lines automatically, and fit the chosen (or the default) dispersion relation.
import { autoPairLampPeaks } from "../calibration/auto-pair-lamp-peaks";
import type { CalibrationModelKind } from "../calibration/calibration-model";
import { fitCalibration, type FitCalibrationResult } from "../calibration/fit-calibration";
import type { LampLine, LampPairingResult } from "../calibration/lamp-pairing-types";
import { findPeaks } from "../peaks/find-peaks";
import { binSamples } from "../signal/bin-samples";
import { binningFactorFor } from "../signal/binning-factor-for";
import type { DispersionKind, Peak } from "../types";

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
  /** Seed of the pairing's random draws.
   * @default 1 */
  seed?: number;
}

export interface LampCalibration {
  peaks: Peak[];
  pairing: LampPairingResult;
  /** The fit, or null when pairing needs manual help. */
  fit: FitCalibrationResult | null;
}

export function calibrateLamp(
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
  const factor = binningFactorFor(resolutionNm / (spanNm / (x.length - 1)));
  const binned = binSamples(x, y, { factor });
  const peaks = findPeaks(binned.x, binned.y, { source: "lamp", minSnr });
  const domain: [number, number] = [x[0], x[x.length - 1]];
  const pairing = autoPairLampPeaks(peaks, lines, {
    nominalRangeNm: options.nominalRangeNm,
    dispersion: options.dispersion,
    resolutionNm: options.resolutionNm,
    domain,
    seed,
  });
  if (pairing.status !== "paired") return { peaks, pairing, fit: null };
  const fit =
    model === "auto"
      ? pairing.model
      : fitCalibration(pairing.pairs, { model: model.kind, degree: model.degree, domain });
  return { peaks, pairing, fit };
}
