// A recalibration's result as every pairing reports it: "paired" when every check passed, otherwise
// "check" with the reasons, the candidate fit and the pairs of a strong rival drift.
import type { FitCalibrationResult } from "./fit-calibration";
import type { LampPair, LampPairingResult } from "./lamp-pairing-types";
import type { PairingContext } from "./pairing-context";
import type { RecalibrationVerdict } from "./recalibration-checks";
import { RECALIBRATION_LIMITS } from "./recalibration-limits";

/**
 * The pairing result of a recalibration whose drift holds `pairs` and fits as `fit`, judged by
 * `verdict`; `rivalPairs` are shown when the rival drift is too strong, `words` describe the drift.
 */
export function recalibrationResult(
  context: PairingContext,
  verdict: RecalibrationVerdict,
  fit: FitCalibrationResult,
  pairs: LampPair[],
  rival: { pairs: LampPair[] },
  { moved, stretched }: { moved: string; stretched: string },
): LampPairingResult {
  const { peaks, lines, candidateLines } = context;
  const { checks, margin, rivalShare } = verdict;
  const limits = RECALIBRATION_LIMITS;
  const pairedLines = new Set(pairs.map((p) => p.lineIndex));
  const passed = checks.every((c) => c.passed);
  const reasons = checks.filter((c) => !c.passed).map((c) => c.reason);
  const rivalPairs =
    rivalShare > limits.maxRivalShare ? rival.pairs.sort((a, b) => a.x - b.x) : undefined;
  return {
    status: passed ? "paired" : "check",
    checks,
    reasons,
    candidate: passed ? null : fit,
    confidence: passed ? 0.5 + 0.5 * margin : Math.min(0.49, 0.5 * margin),
    pairs: passed ? pairs : [],
    model: passed ? fit : null,
    suggestion: pairs,
    ...(rivalPairs ? { rivalSuggestion: rivalPairs } : {}),
    unmatchedPeaks: passed
      ? peaks.filter((_, i) => !pairs.some((p) => p.peakIndex === i))
      : peaks.slice(),
    unmatchedLines: candidateLines
      .filter((l) => !passed || !pairedLines.has(l))
      .map((l) => lines[l]),
    message: passed
      ? `recalibrated from the previous calibration (${moved}, ${stretched}): ${pairs.length} lamp lines agree, RMS ${fit.rmsNm.toFixed(4)} nm`
      : `check this recalibration: ${reasons.join("; ")}`,
  };
}
