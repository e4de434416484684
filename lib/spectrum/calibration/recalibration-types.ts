// What the stages of a recalibration from the previous calibration hand each other: the lamp lines
// placed by yesterday's model, the drifts searched, the candidate pairs and the fits of a drift.
import type { LinearDrift } from "./drifted-model";
import type { LampPair } from "./lamp-pairing-types";

/** A lamp line where yesterday's model puts it, with its weight in the drift's score. */
export interface Predicted {
  line: number;
  /** Yesterday's pixel of the line. */
  u: number;
  weight: number;
  /** 1σ of a blend group's top, in x units (0 for a single line). */
  sigmaX: number;
}

/** A drift of the coarse grid: x = middle + (u − middle)·stretch + shift. */
export interface GridDrift {
  stretch: number;
  shift: number;
}

/** The drift the lamp lines agree on, refitted, with the pairs on it and those set aside. */
export interface DriftFit {
  pairs: LampPair[];
  /** Summed weight of the lines on the drift. */
  score: number;
  /** The pairs' score as the consensus scores lines (by weight and how tightly each sits on the fitted
   * drift, within CONSENSUS_REACH tolerances): what a rival drift is held against (rival-drift.ts). */
  tightScore: number;
  rejected: LampPair[];
  drift: LinearDrift;
  /** RMS of the kept pairs about the drift, x units (dof-corrected). */
  scatterX: number;
  /** Largest departure of a significant quadratic drift from the straight one, x units (0 when none). */
  bendX: number;
}

/** A peak near where a drift puts a line: a pair the consensus may keep. */
export interface Candidate {
  pair: LampPair;
  u: number;
  weight: number;
  /** Largest residual on a drift for this pair to count as on it, x units. */
  reach: number;
}

/** A straight drift fitted to pairs. */
export interface StraightFit {
  at: (u: number) => number;
  drift: LinearDrift;
  /** RMS of the pairs about the line, x units (dof-corrected; infinite with two pairs). */
  scatter: number;
}
