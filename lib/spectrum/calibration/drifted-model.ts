// A calibration moved by a day's drift. Yesterday's model gives λ at yesterday's pixel u; today the
// same ray lands at x = stretch·u + offset (the array shifted and the image scale changed a little
// with temperature or a knock). Every model kind takes such a linear map exactly: polynomial and
// Hartmann models through their x normalisation, the prism model through its camera axis and focal
// length. The drift's own uncertainty is added to the parameters it moves, to first order.
import type { CalibrationModel } from "./calibration-model";

/** Today's x of yesterday's pixel u is stretch·u + offset. */
export interface LinearDrift {
  stretch: number;
  offset: number;
  /**
   * Covariance of [today's x at the pairs' middle, stretch] (x units², x units, 1): the drift's
   * uncertainty, least at `pivot`.
   */
  covariance: [[number, number], [number, number]];
  /** Today's x of the pairs' middle, about which the drift was fitted. */
  pivot: number;
}

function plusDiagonal(covariance: number[][], additions: Map<number, number>): number[][] {
  return covariance.map((row, a) =>
    row.map((value, b) => (a === b ? value + (additions.get(a) ?? 0) : value)),
  );
}

/**
 * `previous` moved by `drift`: evaluated at stretch·u + offset it gives what `previous` gave at u. The
 * domain and covered range are the caller's (today's array, today's evidence).
 */
export function driftedModel(
  previous: CalibrationModel,
  drift: LinearDrift,
  domain: [number, number],
): CalibrationModel {
  const { stretch, offset } = drift;
  if (!(stretch > 0) || !Number.isFinite(offset)) {
    throw new RangeError(`a drift must keep the axis's direction, got stretch ${stretch}`);
  }
  const [[varPivot], [, varStretch]] = drift.covariance;
  const relativeVarStretch = varStretch / (stretch * stretch);
  const today: [number, number] = [domain[0], domain[1]];
  switch (previous.kind) {
    case "polynomial": {
      const { centre, halfRange } = previous.xNormalisation;
      const xNormalisation = { centre: stretch * centre + offset, halfRange: stretch * halfRange };
      // A shift δ of the map moves c₀ by −c₁·δ/h; a relative stretch ε moves c₁ by −c₁·ε.
      const c1 = previous.parameters[1] ?? 0;
      const shiftVar = varPivot + (xNormalisation.centre - drift.pivot) ** 2 * relativeVarStretch;
      const additions = new Map([
        [0, (c1 / xNormalisation.halfRange) ** 2 * shiftVar],
        [1, c1 * c1 * relativeVarStretch],
      ]);
      return {
        ...previous,
        domain: today,
        xNormalisation,
        covariance: plusDiagonal(previous.covariance, additions),
      };
    }
    case "hartmann": {
      const { centre, halfRange } = previous.xNormalisation;
      const xNormalisation = { centre: stretch * centre + offset, halfRange: stretch * halfRange };
      // A shift moves the pole t₀ by δ/h; a relative stretch ε moves t₀ by t₀·ε and scales c by (1+ε)^α.
      const [, c, t0, alpha] = previous.parameters;
      const shiftVar = varPivot + (xNormalisation.centre - drift.pivot) ** 2 * relativeVarStretch;
      const additions = new Map([
        [1, (alpha * c) ** 2 * relativeVarStretch],
        [2, shiftVar / xNormalisation.halfRange ** 2 + t0 * t0 * relativeVarStretch],
      ]);
      return {
        ...previous,
        domain: today,
        xNormalisation,
        covariance: plusDiagonal(previous.covariance, additions),
      };
    }
    case "prism": {
      // x = axisX + direction·f·(…): the map scales f and moves axisX.
      const parameters = previous.parameters.slice();
      parameters[1] = stretch * previous.parameters[1];
      parameters[2] = stretch * previous.parameters[2] + offset;
      const scale = (k: number) => (k === 1 || k === 2 ? stretch : 1);
      const moved = previous.covariance.map((row, a) => row.map((v, b) => v * scale(a) * scale(b)));
      const additions = new Map([
        [1, parameters[1] ** 2 * relativeVarStretch],
        [2, varPivot + (parameters[2] - drift.pivot) ** 2 * relativeVarStretch],
      ]);
      return { ...previous, domain: today, parameters, covariance: plusDiagonal(moved, additions) };
    }
  }
}
