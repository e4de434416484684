// Entry checks shared by the calibration functions; each throws a RangeError that names the bad input.
import type { CalibrationPair } from "../types";
import { CalibrationError } from "./calibration-error";
import type { CalibrationModel } from "./calibration-model";

/** Every element of `values` is a finite number. */
export function assertFiniteArray(values: ArrayLike<number>, name: string): void {
  for (let i = 0; i < values.length; i++) {
    if (!Number.isFinite(values[i])) {
      throw new RangeError(`${name}[${i}] must be finite, got ${values[i]}`);
    }
  }
}

/** A domain [min, max] with min < max, both finite. */
export function assertDomain(domain: readonly [number, number], name = "domain"): void {
  if (
    !Array.isArray(domain) ||
    domain.length !== 2 ||
    !Number.isFinite(domain[0]) ||
    !Number.isFinite(domain[1])
  ) {
    throw new RangeError(`${name} must be [min, max] with finite numbers`);
  }
  if (!(domain[0] < domain[1])) {
    throw new RangeError(`${name} must have min < max, got [${domain[0]}, ${domain[1]}]`);
  }
}

/** Pairs with finite x and positive finite wavelengths; xUncertainty positive when given. */
export function assertPairs(pairs: readonly CalibrationPair[]): void {
  if (!Array.isArray(pairs)) throw new RangeError("pairs must be an array");
  pairs.forEach((pair, i) => {
    if (!Number.isFinite(pair.x))
      throw new RangeError(`pairs[${i}].x must be finite, got ${pair.x}`);
    if (!(Number.isFinite(pair.wavelengthNm) && pair.wavelengthNm > 0)) {
      throw new RangeError(
        `pairs[${i}].wavelengthNm must be positive and finite, got ${pair.wavelengthNm}`,
      );
    }
    if (
      pair.xUncertainty !== undefined &&
      !(Number.isFinite(pair.xUncertainty) && pair.xUncertainty > 0)
    ) {
      throw new RangeError(
        `pairs[${i}].xUncertainty must be positive and finite, got ${pair.xUncertainty}`,
      );
    }
  });
}

/** A stored model whose parameter vector and covariance have matching sizes. */
export function assertModel(model: CalibrationModel): void {
  if (!model || typeof model !== "object")
    throw new CalibrationError("invalid-model", "model must be an object");
  const p = model.parameters?.length ?? 0;
  if (p === 0 || !Array.isArray(model.covariance) || model.covariance.length !== p) {
    throw new CalibrationError("invalid-model", "model parameters and covariance do not match");
  }
  for (const row of model.covariance) {
    if (!Array.isArray(row) || row.length !== p) {
      throw new CalibrationError("invalid-model", "model covariance must be square");
    }
  }
  assertDomain(model.domain, "model.domain");
}
