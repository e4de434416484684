// Schemas of the notebooks and spectra lists and of opening and renaming a notebook: the new notebook's
// team and title, the rename body (title and the version it was edited from) and the query strings of
// the lists, which reject unknown values with 400.
import { z } from "zod";
import { text } from "./text";
import { RUN_STATUSES, type RunStatus } from "@/lib/runs/types";
import { blank } from "./form-data";

export const notebookTitle = text({ error: "Give the notebook a title." })
  .trim()
  .min(1, "Give the notebook a title.")
  .max(200, "Use at most 200 characters.");

export const notebookRenameSchema = z.object({
  title: notebookTitle,
  version: z
    .number({ error: "Send the version you renamed (reload the page if unsure)." })
    .int()
    .min(0),
});
export type NotebookRenameInput = z.infer<typeof notebookRenameSchema>;

export const notebookCreateSchema = z.object({
  teamId: z.uuid("Choose a team."),
  title: notebookTitle,
});

export function notebookInputFromForm(formData: FormData) {
  return notebookCreateSchema.safeParse({
    teamId: blank(formData.get("teamId")),
    title: blank(formData.get("title")),
  });
}

/** Blank query values mean "no filter". */
const optionalText = (max: number, what: string) =>
  z.preprocess(
    (v) => (typeof v === "string" && v.trim() === "" ? undefined : v),
    text().trim().max(max, `${what} is at most ${max} characters.`).optional(),
  );
const optionalId = (message: string) =>
  z.preprocess((v) => (v === "" ? undefined : v), z.uuid(message).optional());

export const notebookListQuerySchema = z.object({
  q: optionalText(200, "The search text"),
});
export type NotebookListQuery = z.infer<typeof notebookListQuerySchema>;

export const notebookRunsQuerySchema = z.object({
  status: z.preprocess(
    (v) => (v === "" ? undefined : v),
    z
      .enum(RUN_STATUSES as unknown as [RunStatus, ...RunStatus[]], {
        error: `The status is one of ${RUN_STATUSES.join(", ")}.`,
      })
      .optional(),
  ),
  species: optionalText(40, "The species"),
  instrumentId: optionalId("Choose an instrument from the list."),
  q: optionalText(200, "The search text"),
});
export type NotebookRunsQuery = z.infer<typeof notebookRunsQuerySchema>;

export const spectraQuerySchema = z.object({
  instrumentId: optionalId("Choose an instrument from the list."),
  kind: z.preprocess(
    (v) => (v === "" ? undefined : v),
    z.enum(["lamp", "sample"], { error: "The kind is lamp or sample." }).optional(),
  ),
});
export type SpectraQuery = z.infer<typeof spectraQuerySchema>;
