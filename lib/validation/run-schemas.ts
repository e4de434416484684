// Schemas of a run: starting one (a sample, its calibration, the kind of source, analysis settings) and
// its own changes: overriding a call (or withdrawing the override) and its notes. The API parses JSON
// with them; the pages' forms parse FormData through the *FromForm helpers.
import { z } from "zod";
import { text } from "./text";
import { blank, numberOrUndefined } from "./form-data";
import type { FormState } from "./form-state";
import { SOURCE_KINDS, type SourceKind } from "@/lib/spectrum/types";

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

/** Longest reason for an override, and longest notes, in characters. */
export const MAX_OVERRIDE_REASON = 2000;
export const MAX_RUN_NOTES = 20000;

export const runOverrideSchema = z
  .object({
    species: text({ error: "Name the species whose call you override." })
      .trim()
      .min(1, "Name the species whose call you override."),
    verdict: z
      .enum(["present", "possible", "absent"], {
        error: "Choose present, possible or absent (or null to withdraw).",
      })
      .nullable(),
    reason: text({ error: "Give a reason for the override." })
      .trim()
      .min(1, "Give a reason for the override.")
      .max(MAX_OVERRIDE_REASON, `Keep the reason within ${MAX_OVERRIDE_REASON} characters.`),
  })
  .strict();
export type RunOverrideInput = z.infer<typeof runOverrideSchema>;

export const runNotesSchema = z
  .object({
    notes: text({ error: "Send the notes as text." }).max(
      MAX_RUN_NOTES,
      `Keep the notes within ${MAX_RUN_NOTES} characters.`,
    ),
    lockVersion: z.number({ error: "Send the lockVersion you read with the run." }).int().min(0),
  })
  .strict();
export type RunNotesInput = z.infer<typeof runNotesSchema>;

/** The override form: verdict "withdraw" (or empty) sends null. */
export function runOverrideFromForm(formData: FormData) {
  const verdict = String(formData.get("verdict") ?? "");
  return runOverrideSchema.safeParse({
    species: String(formData.get("species") ?? ""),
    verdict: verdict === "" || verdict === "withdraw" ? null : verdict,
    reason: String(formData.get("reason") ?? ""),
  });
}

export function runNotesFromForm(formData: FormData) {
  const lockVersion = Number(formData.get("lockVersion"));
  return runNotesSchema.safeParse({ notes: String(formData.get("notes") ?? ""), lockVersion });
}

/** The notes form's state; `newer` carries the notes someone saved since the form was opened. */
export interface RunNotesState extends FormState {
  newer?: { notes: string; lockVersion: number };
}
