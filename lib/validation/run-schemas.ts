// Schemas of a run's own changes: overriding a call (or withdrawing the override) and its notes.
// The API parses JSON with them; the run page's forms parse FormData through the *FromForm helpers.
import { z } from "zod";
import { text } from "./text";

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
