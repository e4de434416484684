// Schemas of the workflow API: instruments, spectrum uploads, calibrations, notebooks and runs.
// Route handlers parse with these; the services check what depends on stored data.
import { z } from "zod";
import { text } from "./text";
import {
  CALIBRATION_MODELS,
  GLASS_NAMES,
  type CalibrationModelChoice,
  type GlassName,
} from "@/lib/spectrum/calibration";
import {
  FIRST_COLUMN_KINDS,
  SOURCE_KINDS,
  type FirstColumnKind,
  type SourceKind,
} from "@/lib/spectrum/types";
import { AppError } from "@/lib/errors";

/** Largest upload, in bytes (16 MiB). Bigger files get 413 before they are parsed. */
export const MAX_UPLOAD_BYTES = 16 * 1024 * 1024;
/** Largest number of points in an uploaded spectrum. */
export const MAX_UPLOAD_POINTS = 2_000_000;

const positive = (what: string) =>
  z
    .number({ error: `Enter ${what}.` })
    .finite()
    .positive(`${what} must be positive.`);

const MEDIA = ["air", "vacuum"] as const;

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
    .enum(MEDIA, { error: "The exportMedium is air or vacuum, or null when not known." })
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
        i.exportMedium == null ||
        i.exportXUnit === undefined ||
        i.exportXUnit === "nm" ||
        i.exportXUnit === "angstrom",
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

/**
 * What an upload may say its first column holds: the export profile's kinds, and plain "pixel" (pixel
 * indices counted as the instrument's profile or the values tell).
 */
export const UPLOAD_X_UNITS = [...FIRST_COLUMN_KINDS, "pixel"] as const;

export const spectrumUploadFieldsSchema = z.object({
  instrumentId: z.uuid("Choose an instrument."),
  kind: z.enum(["lamp", "sample"], { error: "Say whether this is a lamp or a sample spectrum." }),
  label: text().trim().max(200, "Use at most 200 characters.").default(""),
  xUnit: z
    .enum(UPLOAD_X_UNITS as unknown as [FirstColumnKind | "pixel", ...FirstColumnKind[]], {
      error: `The xUnit, what the file's first column holds, is one of ${UPLOAD_X_UNITS.join(", ")}.`,
    })
    .optional(),
  medium: z
    .enum(MEDIA, { error: "The medium, of a wavelength column, is air or vacuum." })
    .optional(),
});

export { CALIBRATION_MODELS, type CalibrationModelChoice };

/** A pair named by its peak's pixel and its line's wavelength, as the workbench shows them. */
function pairRef(verb: string) {
  return z.object({
    pixel: z
      .number({ error: `Give the pixel of the pair to ${verb}.` })
      .finite("Give the pixel as a number."),
    wavelengthNm: z
      .number({ error: `Give the line wavelength (nm) of the pair to ${verb}.` })
      .finite("Give the wavelength as a number.")
      .positive("The wavelength must be positive."),
  });
}

export const calibrationCreateSchema = z.object({
  instrumentId: z.uuid("Choose an instrument."),
  spectrumId: z.uuid("Choose a lamp spectrum."),
  lamps: z
    .array(
      text()
        .trim()
        .regex(/^[A-Z][a-z]?$/, "Name each lamp gas by its element symbol (Hg, Ar, Ne…)."),
      {
        error: "List the lamp gases.",
      },
    )
    .min(1, "List the lamp gases.")
    .max(20),
  model: z
    .enum(CALIBRATION_MODELS, { error: `The model is one of ${CALIBRATION_MODELS.join(", ")}.` })
    .default("auto"),
  /** Hand-picked seed pairs (2 or 3) when automatic pairing is not trusted. */
  pairs: z
    .array(z.object({ pixel: z.number().finite(), wavelengthNm: z.number().finite().positive() }))
    .min(2, "Pick two or three pairs.")
    .max(3, "Pick two or three pairs.")
    .optional(),
  /** Pairs of the pairing to leave out of the fit, by the pixel and line wavelength the preview showed. */
  excluded: z
    .array(pairRef("leave out"), { error: "Send the excluded pairs as a list." })
    .max(200)
    .default([]),
  /** Pairs made by hand: the lamp peak nearest the pixel with the lamp line at the wavelength (±0.05 nm). */
  added: z.array(pairRef("add"), { error: "Send the added pairs as a list." }).max(50).default([]),
  /** Why a doubtful calibration (see calibrationDoubts) should still become the instrument's default. */
  confirmReason: text({ error: "Give the reason as text." })
    .trim()
    .min(
      10,
      "Say in at least 10 characters why this calibration can be trusted despite its doubts.",
    )
    .max(500, "Keep the reason under 500 characters.")
    .optional(),
});
export type CalibrationCreateInput = z.infer<typeof calibrationCreateSchema>;

export const evaluateSchema = z.object({
  pixels: z
    .array(z.number().finite(), { error: "Send the pixels as an array of numbers." })
    .min(1)
    .max(100_000),
});

export const notebookCreateSchema = z.object({
  teamId: z.uuid("Choose a team."),
  title: text({ error: "Give the notebook a title." })
    .trim()
    .min(1, "Give the notebook a title.")
    .max(200),
});

export const runCreateSchema = z.object({
  notebookId: z.uuid("Choose a notebook."),
  spectrumId: z.uuid("Choose a sample spectrum."),
  calibrationId: z.uuid("Choose a calibration.").nullable().optional(),
  source: z.enum(SOURCE_KINDS as unknown as [SourceKind, ...SourceKind[]], {
    error: `The source is one of ${SOURCE_KINDS.join(", ")}.`,
  }),
  settings: z
    .object({
      minSnr: z.number().finite().min(1).max(1000).optional(),
      k: z.number().finite().gt(0).max(20).optional(),
      temperatureK: z.number().finite().min(500).max(20000).optional(),
    })
    .strict()
    .default({}),
});
export type RunCreateInput = z.infer<typeof runCreateSchema>;

/** A team id from the query string: absent means the actor's first team; malformed means not found. */
export function teamIdQuery(request: Request, fallback: string | undefined): string {
  const given = new URL(request.url).searchParams.get("teamId");
  if (given !== null && !z.uuid().safeParse(given).success)
    throw new AppError("not_found", "No such team.");
  const teamId = given ?? fallback;
  if (!teamId) throw new AppError("not_found", "You are not in a team yet.");
  return teamId;
}
