// The lamp's peaks as the workbench shows them: where the fitted model puts each, its line when paired
// and why it is not when unpaired, and the lamp lines expected on the array that found no peak.
import type { CalibrationModel } from "../calibration/calibration-model";
import { dispersionAt } from "../calibration/dispersion-at";
import { evaluateCalibration } from "../calibration/evaluate-calibration";
import type { LampLine } from "../calibration/lamp-pairing-types";
import { unpairedLampPeaks, type UnpairedPeakReasonCode } from "../calibration/unpaired-lamp-peaks";
import type { Peak } from "../types";
import type {
  EditedLampCalibration,
  EditLampCalibrationOptions,
} from "./edit-lamp-calibration-types";

const UNPAIRED_REASON_WORDS: Record<UnpairedPeakReasonCode, string> = {
  broad: "too broad for one lamp line",
  blend: "blend",
  "not-in-table": "not in the table",
  "line-paired-elsewhere": "line paired with another peak",
  "left-unpaired": "left unpaired",
  "no-wavelength": "no wavelength",
};

/**
 * Each of `peaks` under `model`, paired (`pairedPeak`: peak index → line index, excluded pairs
 * included) or with the reason it is unpaired, and the unpaired lamp lines (`pairedLines` are paired)
 * that `model` puts on the array with no peak within reach.
 */
export function explainedLampPeaks(
  model: CalibrationModel,
  peaks: readonly Peak[],
  lines: readonly LampLine[],
  pairedPeak: ReadonlyMap<number, number>,
  pairedLines: ReadonlySet<number>,
  options: EditLampCalibrationOptions,
): Pick<EditedLampCalibration, "peaks" | "expectedWithoutPeak"> {
  const { domain } = options;
  const predicted = evaluateCalibration(model, Float64Array.from(peaks.map((p) => p.x)));
  // Why peaks stay unpaired, in calibrated wavelength with each peak's FWHM turned into nm.
  const localDispersion = dispersionAt(model, Float64Array.from(peaks.map((p) => p.x)));
  const arrayEndsNm = Array.from(evaluateCalibration(model, Float64Array.from(domain)));
  const fallbackFwhmNm =
    options.resolutionNm ?? Math.abs(options.nominalRangeNm[1] - options.nominalRangeNm[0]) / 500;
  const explained =
    arrayEndsNm.every(Number.isFinite) && arrayEndsNm[0] !== arrayEndsNm[1]
      ? unpairedLampPeaks(
          peaks.map((p, i) => ({
            wavelengthNm: predicted[i],
            // A width the model cannot turn into nm falls back to the instrument's resolution.
            fwhmNm:
              Number.isFinite(localDispersion[i]) && localDispersion[i] !== 0
                ? p.fwhm * Math.abs(localDispersion[i])
                : fallbackFwhmNm,
            paired: pairedPeak.has(i),
          })),
          lines.map((l, i) => ({ wavelengthNm: l.wavelengthNm, paired: pairedLines.has(i) })),
          { arrayRangeNm: [Math.min(...arrayEndsNm), Math.max(...arrayEndsNm)] },
        )
      : null;
  const lineRef = (j: number) => ({
    wavelengthNm: lines[j].wavelengthNm,
    species: lines[j].species,
  });

  return {
    peaks: peaks.map((p, i) => {
      const line = pairedPeak.has(i) ? lines[pairedPeak.get(i)!] : null;
      const reason = explained?.peakReasons[i] ?? null;
      const code = reason?.code ?? "no-wavelength";
      return {
        pixel: p.x,
        height: p.height,
        fwhm: p.fwhm,
        snr: p.snr,
        predictedNm: Number.isFinite(predicted[i]) ? predicted[i] : null,
        pairedWith: line ? { wavelengthNm: line.wavelengthNm, species: line.species } : null,
        unpaired: line
          ? null
          : {
              code,
              reason: UNPAIRED_REASON_WORDS[code],
              lines: (reason?.lineIndices ?? []).map(lineRef),
            },
      };
    }),
    expectedWithoutPeak: (explained?.expectedWithoutPeak ?? []).map((j) => ({
      wavelengthNm: lines[j].wavelengthNm,
      species: lines[j].species,
      intensity: lines[j].intensity,
      reason: "below threshold" as const,
    })),
  };
}
