// Schemas of an instrument, added or edited: the API parses JSON with them, the instrument pages' forms
// parse FormData through the *FromForm helpers (numbers typed as text, blank optional fields cleared).
// The services check what depends on stored data.
import { z } from "zod";
import { text } from "./text";
import { blank, numberOrUndefined } from "./form-data";
import { MAX_UPLOAD_POINTS } from "./upload-schemas";
import { GLASS_NAMES, type GlassName } from "@/lib/spectrum/calibration";
import { FIRST_COLUMN_KINDS, WAVELENGTH_MEDIA, type FirstColumnKind } from "@/lib/spectrum/types";
import { isWavelengthUnit } from "@/lib/spectrum/types";

const positive = (what: string) =>
  z
    .number({ error: `Enter ${what}.` })
    .finite()
    .positive(`${what} must be positive.`);

/** Names of the first-column kinds as the messages list them. */
const FIRST_COLUMN_LIST = FIRST_COLUMN_KINDS.join(", ");

/** The instrument's own fields, shared by the create and update schemas. */
const instrumentFields = {
  name: text({ error: "Name the instrument." }).trim().min(1, "Name the instrument.").max(120),
  dispersion: z.enum(["prism", "grating"], { error: "Choose prism or grating." }),
  pixels: z.number({ error: "Enter the number of pixels." }).int().min(16).max(MAX_UPLOAD_POINTS),
  nominalMinNm: positive("the shortest nominal wavelength"),
  nominalMaxNm: positive("the longest nominal wavelength"),
  resolutionNm: positive("the resolution (FWHM in nm)"),
  detectorMax: positive("the detector maximum").nullable().optional(),
  glass: z
    .enum(GLASS_NAMES as unknown as [GlassName, ...GlassName[]], {
      error: `Choose one of ${GLASS_NAMES.join(", ")}.`,
    })
    .nullable()
    .optional(),
  apexDeg: z
    .number()
    .finite()
    .gt(0)
    .lt(90, "The apex angle must be below 90°.")
    .nullable()
    .optional(),
  /** The export profile: what the first column of the instrument's files holds (null: not set). */
  exportXUnit: z
    .enum(FIRST_COLUMN_KINDS as unknown as [FirstColumnKind, ...FirstColumnKind[]], {
      error: `The exportXUnit, the first column of this instrument's files, is one of ${FIRST_COLUMN_LIST}, or null when not known.`,
    })
    .nullable()
    .optional(),
  /** Air or vacuum, for a wavelength profile (nm or angstrom). */
  exportMedium: z
    .enum(WAVELENGTH_MEDIA, { error: "The exportMedium is air or vacuum, or null when not known." })
    .nullable()
    .optional(),
};

type InstrumentFields = z.infer<z.ZodObject<typeof instrumentFields>>;

/** The checks across fields that create and update share: an ordered range, glass and apex only on a prism. */
function withInstrumentChecks<T extends z.ZodType<InstrumentFields>>(schema: T) {
  return schema
    .refine((i) => i.nominalMaxNm > i.nominalMinNm, {
      path: ["nominalMaxNm"],
      message: "The longest wavelength must be above the shortest.",
    })
    .refine((i) => i.dispersion === "prism" || (i.glass == null && i.apexDeg == null), {
      path: ["glass"],
      message: "Only a prism has a glass and an apex angle.",
    })
    .refine(
      (i) =>
        i.exportMedium == null || i.exportXUnit === undefined || isWavelengthUnit(i.exportXUnit),
      {
        path: ["exportMedium"],
        message: "Only wavelengths (nm or angstrom) are in air or vacuum: leave exportMedium out.",
      },
    );
}

export const instrumentCreateSchema = withInstrumentChecks(
  z.object({ teamId: z.uuid("Choose a team."), ...instrumentFields }),
);
export type InstrumentCreateInput = z.infer<typeof instrumentCreateSchema>;

/**
 * An edit of an instrument: every field of the create form again (the team is fixed) and the version the
 * editor saw. detectorMax, glass, apexDeg, exportXUnit and exportMedium left out keep their stored
 * value; null clears them.
 */
export const instrumentUpdateSchema = withInstrumentChecks(
  z.object({
    ...instrumentFields,
    version: z
      .number({ error: "Send the version of the instrument you edited." })
      .int("Send the version of the instrument you edited.")
      .min(0, "Send the version of the instrument you edited."),
  }),
);
export type InstrumentUpdateInput = z.infer<typeof instrumentUpdateSchema>;

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
    exportMedium: isWavelengthUnit(blank(formData.get("exportXUnit")))
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
