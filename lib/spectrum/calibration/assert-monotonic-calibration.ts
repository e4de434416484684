// Refuses a solution that turns back on the array: a dispersion relation must be one-to-one.
import { CalibrationError } from "./calibration-error";
import type { CalibrationModel } from "./calibration-model";
import { modelEvaluation } from "./model-evaluation";

const CHECK_POINTS = 1025;

/** Throws CalibrationError("non-monotonic") when dλ/dx changes sign, vanishes or is undefined on the domain. */
export function assertMonotonicCalibration(model: CalibrationModel): void {
  const [xMin, xMax] = model.domain;
  const x = new Float64Array(CHECK_POINTS);
  for (let i = 0; i < CHECK_POINTS; i++) x[i] = xMin + ((xMax - xMin) * i) / (CHECK_POINTS - 1);
  const { wavelengthNm, dispersion } = modelEvaluation(model, x);
  const sign = Math.sign(dispersion[CHECK_POINTS >> 1]);
  for (let i = 0; i < CHECK_POINTS; i++) {
    if (!Number.isFinite(wavelengthNm[i]) || !(Math.sign(dispersion[i]) === sign) || sign === 0) {
      throw new CalibrationError(
        "non-monotonic",
        `the ${model.kind} solution is not monotonic over the array domain [${xMin}, ${xMax}]: ` +
          `dλ/dx is ${dispersion[i]} at x = ${x[i]} — use fewer parameters, another model, or more pairs near the ends`,
        { x: x[i], dispersion: dispersion[i] },
      );
    }
  }
}
