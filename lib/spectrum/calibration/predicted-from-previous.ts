// The lamp lines where the previous calibration puts them: the pixels a recalibration's drift moves.
import type { CalibrationModel } from "./calibration-model";
import { modelEvaluation } from "./model-evaluation";
import type { PairingContext } from "./pairing-context";
import type { Predicted } from "./recalibration-types";

/**
 * Each candidate lamp line at yesterday's pixel u = `xOf(λ)` (lines `xOf` cannot place are left out),
 * weighted by its intensity, with a blend group's σ turned into x units by `previous`'s dispersion.
 */
export function predictedFromPrevious(
  context: PairingContext,
  previous: CalibrationModel,
  xOf: (lambda: number) => number,
): Predicted[] {
  const { lines, candidateLines } = context;
  // Strong lines count more: a chance coincidence with a faint line is cheap, with a strong one rare.
  const located = candidateLines
    .map((line) => ({
      line,
      u: xOf(lines[line].wavelengthNm),
      weight: 1 + Math.log1p(Math.max(lines[line].intensity, 0)),
    }))
    .filter((p) => Number.isFinite(p.u));
  const nmPerX = modelEvaluation(
    previous,
    located.map((p) => p.u),
  ).dispersion;
  return located.map((p, i) => {
    const sigmaNm = (lines[p.line] as { wavelengthSigmaNm?: number }).wavelengthSigmaNm ?? 0;
    return { ...p, sigmaX: sigmaNm > 0 ? sigmaNm / Math.abs(nmPerX[i]) : 0 };
  });
}
