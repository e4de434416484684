// Form variants of the workflow schemas: the pages' forms send strings, these turn them into the
// API's inputs (numbers, lists, empty = not given) so server actions and routes share one schema each.
import { z } from "zod";
import { zodFieldErrors } from "./field-errors";
import type { FormState } from "./form-state";
import {
  CALIBRATION_MODELS,
  instrumentCreateSchema,
  instrumentUpdateSchema,
  notebookCreateSchema,
  runCreateSchema,
} from "./workflow-schemas";

/** The lamp gases offered on the calibrate form (the common pencil and discharge lamps). */
export const LAMP_GASES = ["Hg", "Ar", "Ne", "He", "Kr", "Xe", "Na", "H"] as const;

const blank = (value: FormDataEntryValue | null) => (typeof value === "string" ? value.trim() : "");
const numberOrUndefined = (value: FormDataEntryValue | null) => {
  const text = blank(value).replace(",", ".");
  return text === "" ? undefined : Number(text);
};

/** The instrument form's fields: numbers typed as text, blank optional fields sent as null (cleared),
 * "not set" in the export profile's selects as null. */
function instrumentFieldsFromForm(formData: FormData) {
  return {
    name: blank(formData.get("name")),
    dispersion: blank(formData.get("dispersion")) || undefined,
    pixels: numberOrUndefined(formData.get("pixels")),
    nominalMinNm: numberOrUndefined(formData.get("nominalMinNm")),
    nominalMaxNm: numberOrUndefined(formData.get("nominalMaxNm")),
    resolutionNm: numberOrUndefined(formData.get("resolutionNm")),
    detectorMax: numberOrUndefined(formData.get("detectorMax")) ?? null,
    glass: blank(formData.get("glass")) || null,
    apexDeg: numberOrUndefined(formData.get("apexDeg")) ?? null,
    exportXUnit: blank(formData.get("exportXUnit")) || null,
    // The medium belongs to wavelengths only; the form keeps its select hidden for other columns.
    exportMedium: ["nm", "angstrom"].includes(blank(formData.get("exportXUnit")))
      ? blank(formData.get("exportMedium")) || null
      : null,
  };
}

/** The new-instrument form: glass and apex only for a prism. */
export function instrumentInputFromForm(formData: FormData) {
  return instrumentCreateSchema.safeParse({
    teamId: blank(formData.get("teamId")),
    ...instrumentFieldsFromForm(formData),
  });
}

/** The edit form: the same fields plus the version the page showed (a hidden field). */
export function instrumentUpdateFromForm(formData: FormData) {
  return instrumentUpdateSchema.safeParse({
    ...instrumentFieldsFromForm(formData),
    version: numberOrUndefined(formData.get("version")),
  });
}

export function notebookInputFromForm(formData: FormData) {
  return notebookCreateSchema.safeParse({
    teamId: blank(formData.get("teamId")),
    title: blank(formData.get("title")),
  });
}

/** The new-run form: settings left blank are not sent, so the core's defaults apply. */
export function runInputFromForm(formData: FormData) {
  const settings = Object.fromEntries(
    (["minSnr", "k", "temperatureK"] as const)
      .map((key) => [key, numberOrUndefined(formData.get(key))] as const)
      .filter(([, value]) => value !== undefined),
  );
  return runCreateSchema.safeParse({
    notebookId: blank(formData.get("notebookId")),
    spectrumId: blank(formData.get("spectrumId")),
    calibrationId: blank(formData.get("calibrationId")) || null,
    source: blank(formData.get("source")) || undefined,
    settings,
  });
}

/** Field errors of a failed parse, with the one message every form shows above them. */
export function invalidFormState(error: z.ZodError, values?: Record<string, string>): FormState {
  return { message: "Some fields need another look.", fieldErrors: zodFieldErrors(error), values };
}

/** The values typed into a form, shown again after a failed submit. */
export function formValues(formData: FormData): Record<string, string> {
  const values: Record<string, string> = {};
  for (const [key, value] of formData)
    if (typeof value === "string" && !key.startsWith("$")) values[key] = value;
  return values;
}

export const MODEL_CHOICES: { value: (typeof CALIBRATION_MODELS)[number]; label: string }[] = [
  { value: "auto", label: "Chosen by the fit (recommended)" },
  { value: "polynomial-1", label: "Polynomial, degree 1" },
  { value: "polynomial-2", label: "Polynomial, degree 2" },
  { value: "polynomial-3", label: "Polynomial, degree 3" },
  { value: "polynomial-4", label: "Polynomial, degree 4" },
  { value: "polynomial-5", label: "Polynomial, degree 5" },
  { value: "hartmann", label: "Hartmann dispersion formula (prisms)" },
  { value: "prism", label: "Physical prism model (glass + apex)" },
];
