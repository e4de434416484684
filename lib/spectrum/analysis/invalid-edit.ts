// The error of a bad hand edit on the calibration workbench.
import { CalibrationError } from "../calibration/calibration-error";

/** A bad hand edit: a 400 in the service, with the field it is about. */
export function invalidEdit(
  message: string,
  field: string,
  fieldMessage: string,
): CalibrationError {
  return new CalibrationError("invalid-edit", message, { field, fieldMessage });
}
