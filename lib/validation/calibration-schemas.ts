// Schemas of a lamp calibration: the calibrate request (lamps, model, seed pairs, the workbench's
// excluded and added pairs, the reason to keep a doubtful one) and the evaluation of a stored one, with
// the calibrate form's choices. The services check what depends on stored data.
import { z } from "zod";
import { text } from "./text";
import { CALIBRATION_MODELS, type CalibrationModelChoice } from "@/lib/spectrum/calibration";

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

/** The lamp gases offered on the calibrate form (the common pencil and discharge lamps). */
export const LAMP_GASES = ["Hg", "Ar", "Ne", "He", "Kr", "Xe", "Na", "H"] as const;

export const MODEL_CHOICES: { value: CalibrationModelChoice; label: string }[] = [
  { value: "auto", label: "Chosen by the fit (recommended)" },
  { value: "polynomial-1", label: "Polynomial, degree 1" },
  { value: "polynomial-2", label: "Polynomial, degree 2" },
  { value: "polynomial-3", label: "Polynomial, degree 3" },
  { value: "polynomial-4", label: "Polynomial, degree 4" },
  { value: "polynomial-5", label: "Polynomial, degree 5" },
  { value: "hartmann", label: "Hartmann dispersion formula (prisms)" },
  { value: "prism", label: "Physical prism model (glass + apex)" },
];
