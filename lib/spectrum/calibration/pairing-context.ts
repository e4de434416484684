// What the refinement of a lamp pairing works on, prepared by either pairing entry point.
import type { DispersionKind } from "../types";
import type { CalibrationModel } from "./calibration-model";
import type { LampLine, LampPeak } from "./lamp-pairing-types";

/** Everything the refinement needs, prepared by the caller. */
export interface PairingContext {
  peaks: LampPeak[];
  lines: LampLine[];
  /** Indices of the lines inside the nominal range (plus margin). */
  candidateLines: number[];
  dispersion: DispersionKind;
  domain: [number, number];
  /** Matching half-width in x units at the end of refinement. */
  toleranceX: number;
  minConfidence: number;
  /** Pairs that must stay (manual seeds), as peak index → line index. */
  forced: Map<number, number>;
  nominalRangeNm: [number, number];
  /** The axis g(λ) in which the expected dispersion is nearly a straight line. */
  straighten: (lambda: number) => number;
  /**
   * The instrument's previous calibration, when the pairs were predicted from it: the final fit keeps
   * its model family (and glass) instead of the dispersion's usual choice of models.
   */
  previousModel?: CalibrationModel;
}
