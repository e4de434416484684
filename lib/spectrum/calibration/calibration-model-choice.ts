// The models a chemist can ask the calibration for, as the workbench's selector and the API name them.

/** "auto" keeps the pairing's own model; the rest name one model (a polynomial by its degree). */
export const CALIBRATION_MODELS = [
  "auto",
  "polynomial-1",
  "polynomial-2",
  "polynomial-3",
  "polynomial-4",
  "polynomial-5",
  "hartmann",
  "prism",
] as const;

export type CalibrationModelChoice = (typeof CALIBRATION_MODELS)[number];

/** The choice that names a fitted model: "polynomial-3", "hartmann", "prism". */
export function calibrationModelChoice(model: {
  kind: string;
  degree?: number;
}): CalibrationModelChoice {
  return (
    model.kind === "polynomial" ? `polynomial-${model.degree}` : model.kind
  ) as CalibrationModelChoice;
}
