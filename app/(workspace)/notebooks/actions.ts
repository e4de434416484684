"use server";
// Server actions of the notebooks area: open a notebook, start a run in one. Each parses its form,
// calls one service and maps the result; the services authorise.
import { revalidatePath } from "next/cache";
import { redirect } from "next/navigation";
import { currentActor } from "@/lib/auth/session";
import { unauthenticated } from "@/lib/errors";
import { createNotebook } from "@/lib/services/notebooks";
import { createRun } from "@/lib/services/runs";
import { formError, type FormState } from "@/lib/validation/form-state";
import { formValues, invalidFormState, notebookInputFromForm, runInputFromForm } from "@/lib/validation/workflow-forms";

async function actorOrThrow() {
  const actor = await currentActor();
  if (!actor) throw unauthenticated();
  return actor;
}

export async function createNotebookAction(_state: FormState, formData: FormData): Promise<FormState> {
  const parsed = notebookInputFromForm(formData);
  if (!parsed.success) return invalidFormState(parsed.error, formValues(formData));
  let id: string;
  try {
    id = (await createNotebook(await actorOrThrow(), parsed.data)).id;
  } catch (error) {
    return { ...formError(error), values: formValues(formData) };
  }
  revalidatePath("/notebooks");
  redirect(`/notebooks/${id}`);
}

export async function startRunAction(_state: FormState, formData: FormData): Promise<FormState> {
  const parsed = runInputFromForm(formData);
  if (!parsed.success) return invalidFormState(parsed.error, formValues(formData));
  let id: string;
  try {
    id = (await createRun(await actorOrThrow(), parsed.data)).id;
  } catch (error) {
    return { ...formError(error), values: formValues(formData) };
  }
  revalidatePath(`/notebooks/${parsed.data.notebookId}`);
  redirect(`/runs/${id}`);
}
