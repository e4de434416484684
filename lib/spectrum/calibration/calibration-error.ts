// Typed error of the calibration stage, so services can tell a bad input from a bad solution by its code.

/** Why a calibration could not be fitted, inverted or evaluated. */
export type CalibrationErrorCode =
  /** Fewer usable pairs than the model needs (n ≥ parameters + 1). */
  | "too-few-pairs"
  /** The fitted λ(x) turns back somewhere on the array domain, so it cannot be a dispersion relation. */
  | "non-monotonic"
  /** The non-linear fit did not reach a usable solution (no finite parameters, singular normal matrix). */
  | "fit-failed"
  /** The prism forward model has no solution for a wavelength (total internal reflection, outside the glass's range). */
  | "not-invertible"
  /** A stored model does not have the shape its kind requires. */
  | "invalid-model"
  /** A named prism glass is not described (or has a resonance) over the wavelengths it would have to serve. */
  | "glass-out-of-range"
  /** The spectrum or the options cannot be calibrated at all (lengths differ, not finite, x not increasing, …). */
  | "invalid-input"
  /** A hand edit names no peak or no line, repeats one, or leaves out a pair that does not exist (details.field names it). */
  | "invalid-edit"
  /** No automatic pairing to start from and no pairs given by hand. */
  | "not-paired"
  /** The hand edits, or the model asked for, need more pairs than remain (details.field names the model when it is the model). */
  | "too-few-pairs-left";

/** Error thrown by the calibration functions; `code` is stable, `message` is for people. */
export class CalibrationError extends Error {
  readonly code: CalibrationErrorCode;
  /** Extra facts for the caller (e.g. pairs needed and pairs given). */
  readonly details: Record<string, unknown>;

  constructor(code: CalibrationErrorCode, message: string, details: Record<string, unknown> = {}) {
    super(message);
    this.name = "CalibrationError";
    this.code = code;
    this.details = details;
  }
}
