// The checks a recalibration's drift must pass to be trusted without the chemist, and the margin by
// which it passes them (the result's confidence).
import type { CalibrationModel } from "./calibration-model";
import { dailyDriftShare } from "./daily-drift-share";
import { EXPECTED_PEAK_REACH, peakWithinReach } from "./expected-peak-reach";
import type { PairingCheck } from "./lamp-pairing-types";
import { modelEvaluation } from "./model-evaluation";
import type { PairingContext } from "./pairing-context";
import { RECALIBRATION_LIMITS } from "./recalibration-limits";
import type { DriftFit, Predicted } from "./recalibration-types";
import { upperMedian } from "../statistics/upper-median";

/** Strongest lamp lines the expected-lines check asks about. */
const EXPECTED_STRONGEST = 10;

/** The checks of a recalibration, with the smallest margin of any (0 to 1) and the rival's share. */
export interface RecalibrationVerdict {
  checks: PairingCheck[];
  margin: number;
  /** The rival drift's score as a share of the chosen one's. */
  rivalShare: number;
}

/**
 * Checks `fitted` (moved onto today's array as `model`, known over `covered`) against
 * RECALIBRATION_LIMITS: enough lines, tight on the drift, no rival nearly as good (`rivalScore`), the
 * drift known over enough of the array, yesterday's own fit tight, a day's size, the strongest lines
 * found. `words` describe the drift in the daily-drift check's reason.
 */
export function recalibrationChecks(
  context: PairingContext,
  previous: CalibrationModel,
  predicted: readonly Predicted[],
  tolerance: number,
  fitted: DriftFit,
  model: CalibrationModel,
  covered: [number, number],
  rivalScore: number,
  { moved, stretched }: { moved: string; stretched: string },
): RecalibrationVerdict {
  const { lines } = context;
  const [xMin, xMax] = context.domain;
  const span = xMax - xMin;
  const { drift, pairs } = fitted;
  const todayX = (u: number) => drift.stretch * u + drift.offset;
  const coveredShare = Math.max(0, covered[1] - covered[0]) / span;
  const pairedLines = new Set(pairs.map((p) => p.lineIndex));
  const onArray = predicted
    .filter((p) => {
      const x = todayX(p.u);
      return x >= xMin + tolerance && x <= xMax - tolerance;
    })
    .sort((a, b) => lines[b.line].intensity - lines[a.line].intensity)
    .slice(0, EXPECTED_STRONGEST);
  // A strong line counts as seen on the drift's pairs, or with any peak where the drift puts it: a
  // saturated or pulled top off the drift by more than a pair may be is still the line. On the
  // re-recorded sweep (200 instruments each of 15400000, 16300000 and the fresh 16800000) this made
  // 4 more recalibrations right and "paired", with no silent wrong before or after.
  const peakXs = context.peaks.map((p) => p.x).sort((a, b) => a - b);
  const seen = onArray.filter(
    (p) =>
      pairedLines.has(p.line) ||
      peakWithinReach(peakXs, todayX(p.u), EXPECTED_PEAK_REACH * tolerance),
  ).length;
  const expectedShare = onArray.length > 0 ? seen / onArray.length : 0;
  const scatter = fitted.scatterX / tolerance;
  // Yesterday's own fit: its shape between and beyond today's lines is only as good as its RMS.
  const todayNmPerX = modelEvaluation(
    model,
    pairs.map((p) => p.x),
  ).dispersion.map(Math.abs);
  const toleranceNm = tolerance * upperMedian(Array.from(todayNmPerX));
  const previousFit = previous.rmsNm / toleranceNm;
  const rivalShare = rivalScore / fitted.score;
  const limits = RECALIBRATION_LIMITS;
  // A drift beyond a day's is a realignment, whose aliases (the lamp's lines moved onto other lines)
  // a few lines can agree with: on the re-recorded sweep (200 instruments of 15400000) the one such
  // recalibration "paired" was 17 nm off, its 8 lines each on another line's peak.
  const dailyShare = dailyDriftShare(drift, context.domain);
  const checks: PairingCheck[] = [
    check(
      "pairs",
      pairs.length,
      pairs.length >= limits.minPairs,
      `only ${pairs.length} lamp lines sit on the drift from the previous calibration; at least ${limits.minPairs} are needed to trust it`,
    ),
    check(
      "residuals",
      scatter,
      scatter <= limits.maxScatter,
      `the lamp lines scatter by ${fitted.scatterX.toFixed(2)} x units about the drift from the previous calibration, as chance coincidences do`,
    ),
    check(
      "rival-pairing",
      rivalShare,
      rivalShare <= limits.maxRivalShare,
      `another drift of the previous calibration puts ${(100 * rivalShare).toFixed(0)} % as many lamp lines on peaks`,
    ),
    check(
      "drift-precision",
      1 - coveredShare,
      coveredShare >= limits.minCoveredShare,
      `the lamp lines fix the drift to ±${(limits.maxDriftSigma * tolerance).toFixed(2)} x units over only ${(100 * coveredShare).toFixed(0)} % of the array`,
    ),
    check(
      "previous-fit",
      previousFit,
      previousFit <= limits.maxPreviousRms,
      `the previous calibration fitted its own lamp lines to an RMS of ${previous.rmsNm.toFixed(3)} nm, too loosely to carry today's`,
    ),
    check(
      "daily-drift",
      dailyShare,
      dailyShare <= 1,
      `the array ${moved} and was ${stretched} since the previous calibration, more than a day's drift: a realigned instrument is trusted when a blind search finds the same axis, or when you confirm it`,
    ),
    check(
      "expected-lines",
      expectedShare,
      expectedShare >= limits.minExpectedShare,
      `only ${seen} of the ${onArray.length} strongest lamp lines found a peak where the moved calibration puts them`,
    ),
  ];
  const margins = [
    limits.minPairs > 0 ? Math.min(1, (pairs.length - limits.minPairs + 1) / 8) : 1,
    1 - scatter / limits.maxScatter,
    1 - rivalShare / limits.maxRivalShare,
    (coveredShare - limits.minCoveredShare) / (1 - limits.minCoveredShare),
    1 - previousFit / limits.maxPreviousRms,
    (expectedShare - limits.minExpectedShare) / (1 - limits.minExpectedShare),
  ];
  const margin = Math.min(1, Math.max(0, Math.min(...margins)));
  return { checks, margin, rivalShare };
}

function check(
  name: PairingCheck["name"],
  value: number,
  passed: boolean,
  reason: string,
): PairingCheck {
  return { name, value, passed, reason: passed ? "" : reason };
}
