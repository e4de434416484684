// Evaluates any stored calibration model at x: wavelength, dispersion dλ/dx and, on request, the
// Jacobian ∂λ/∂parameters that the uncertainty and the fits need. Shared by the public evaluators.
import { CalibrationError } from "./calibration-error";
import type { CalibrationModel, PrismCalibrationModel } from "./calibration-model";
import { fittedGlassCoefficients, fittedGlassTermsOf } from "./fitted-glass";
import {
  prismForward,
  prismForwardX,
  prismInverseWavelengths,
  type PrismGeometry,
} from "./prism-forward";

/** Wavelengths, dispersion and (optionally) the parameter Jacobian at each x. */
export interface ModelEvaluation {
  wavelengthNm: Float64Array;
  /** dλ/dx in nm per x unit. */
  dispersion: Float64Array;
  /** Row-major (x.length × parameters) ∂λ/∂p, present when asked for. */
  jacobian?: Float64Array;
}

/** Geometry of a stored prism model with the given parameter vector. */
export function prismGeometryOf(
  model: PrismCalibrationModel,
  parameters = model.parameters,
): PrismGeometry {
  return {
    glass: model.glass,
    incidenceRad: parameters[0],
    focalX: parameters[1],
    axisX: parameters[2],
    apexRad: model.apexFitted ? parameters[3] : (model.apexDeg * Math.PI) / 180,
    direction: model.direction,
    referenceWavelengthNm: model.referenceWavelengthNm,
    axisAngleRad: model.axisAngleFitted ? parameters[model.apexFitted ? 4 : 3] : 0,
    ...(model.glassFitted
      ? { sellmeier: fittedGlassCoefficients(fittedGlassTermsOf(parameters)) }
      : {}),
  };
}

/** Evaluates `model` at every x. */
export function modelEvaluation(
  model: CalibrationModel,
  x: ArrayLike<number>,
  withJacobian = false,
): ModelEvaluation {
  const count = x.length;
  const parameterCount = model.parameters.length;
  const wavelengthNm = new Float64Array(count);
  const dispersion = new Float64Array(count);
  const jacobian = withJacobian ? new Float64Array(count * parameterCount) : undefined;
  const { centre, halfRange } = model.xNormalisation;
  if (!(halfRange > 0) || model.covariance.length !== parameterCount) {
    throw new CalibrationError(
      "invalid-model",
      "calibration model has an invalid normalisation or covariance",
    );
  }

  switch (model.kind) {
    case "polynomial": {
      const c = model.parameters;
      for (let i = 0; i < count; i++) {
        const t = (x[i] - centre) / halfRange;
        let value = 0;
        let slope = 0;
        let power = 1;
        for (let k = 0; k < c.length; k++) {
          if (jacobian) jacobian[i * parameterCount + k] = power;
          value += c[k] * power;
          if (k + 1 < c.length) slope += (k + 1) * c[k + 1] * power;
          power *= t;
        }
        wavelengthNm[i] = value;
        dispersion[i] = slope / halfRange;
      }
      break;
    }
    case "hartmann": {
      const [lambda0, c, t0, alpha] = model.parameters;
      const side = model.poleSide;
      for (let i = 0; i < count; i++) {
        const t = (x[i] - centre) / halfRange;
        const base = side * (t0 - t);
        if (!(base > 0)) {
          wavelengthNm[i] = Number.NaN;
          dispersion[i] = Number.NaN;
          jacobian?.fill(Number.NaN, i * parameterCount, (i + 1) * parameterCount);
          continue;
        }
        const powered = base ** -alpha;
        wavelengthNm[i] = lambda0 + c * powered;
        dispersion[i] = (side * alpha * c * powered) / base / halfRange;
        if (jacobian) {
          const row = i * parameterCount;
          jacobian[row] = 1;
          jacobian[row + 1] = powered;
          jacobian[row + 2] = (-side * alpha * c * powered) / base;
          jacobian[row + 3] = -c * powered * Math.log(base);
        }
      }
      break;
    }
    case "prism": {
      const geometry = prismGeometryOf(model);
      const forward = prismForward(geometry);
      wavelengthNm.set(prismInverseWavelengths(geometry, x));
      for (let i = 0; i < count; i++) {
        const lambda = wavelengthNm[i];
        if (!Number.isFinite(lambda)) {
          dispersion[i] = Number.NaN;
          jacobian?.fill(Number.NaN, i * parameterCount, (i + 1) * parameterCount);
          continue;
        }
        const step = 1e-4 * lambda;
        const dxdLambda = (forward(lambda + step) - forward(lambda - step)) / (2 * step);
        dispersion[i] = 1 / dxdLambda;
        if (jacobian) {
          // Implicit function: x(λ(p), p) = x fixed ⇒ ∂λ/∂p = −(∂x/∂p)/(∂x/∂λ).
          for (let k = 0; k < parameterCount; k++) {
            const h = 1e-6 * Math.max(Math.abs(model.parameters[k]), 1e-2);
            const up = model.parameters.slice();
            const down = model.parameters.slice();
            up[k] += h;
            down[k] -= h;
            const dxdp =
              (prismForwardX(prismGeometryOf(model, up), lambda) -
                prismForwardX(prismGeometryOf(model, down), lambda)) /
              (2 * h);
            jacobian[i * parameterCount + k] = -dxdp / dxdLambda;
          }
        }
      }
      break;
    }
    default:
      throw new CalibrationError(
        "invalid-model",
        `unknown calibration kind "${(model as { kind: string }).kind}"`,
      );
  }
  return { wavelengthNm, dispersion, jacobian };
}
