"use server";
// Server actions of the notebooks area: open a notebook, rename it, start a run in one. Each parses its form,
// calls one service and maps the result; the services authorise.
import { revalidatePath } from "next/cache";
import { redirect } from "next/navigation";
import { requireActor } from "@/lib/auth/session";
import { createNotebook, renameNotebook } from "@/lib/services/notebooks";
import { createRun } from "@/lib/services/runs";
import { formError, invalidFormState, type FormState } from "@/lib/validation/form-state";
import { notebookInputFromForm, notebookRenameSchema } from "@/lib/validation/notebook-schemas";
import { formValues } from "@/lib/validation/form-data";
import { runInputFromForm } from "@/lib/validation/run-schemas";
import { idParam } from "@/lib/validation/request-params";

export async function createNotebookAction(
  _state: FormState,
  formData: FormData,
): Promise<FormState> {
  const parsed = notebookInputFromForm(formData);
  if (!parsed.success) return invalidFormState(parsed.error, formValues(formData));
  let id: string;
  try {
    id = (await createNotebook(await requireActor(), parsed.data)).id;
  } catch (error) {
    return { ...formError(error), values: formValues(formData) };
  }
  revalidatePath("/notebooks");
  redirect(`/notebooks/${id}`);
}

export async function renameNotebookAction(
  _state: FormState,
  formData: FormData,
): Promise<FormState> {
  const notebookId = String(formData.get("notebookId") ?? "");
  const version = formData.get("version");
  const parsed = notebookRenameSchema.safeParse({
    title: formData.get("title") ?? undefined,
    version: typeof version === "string" && version !== "" ? Number(version) : undefined,
  });
  if (!parsed.success) return invalidFormState(parsed.error, formValues(formData));
  try {
    const renamed = await renameNotebook(
      await requireActor(),
      idParam(notebookId, "No such notebook."),
      parsed.data,
    );
    revalidatePath(`/notebooks/${notebookId}`);
    revalidatePath("/notebooks");
    return { ok: true, message: `Renamed to “${renamed.title}”.` };
  } catch (error) {
    return { ...formError(error), values: formValues(formData) };
  }
}

export async function startRunAction(_state: FormState, formData: FormData): Promise<FormState> {
  const parsed = runInputFromForm(formData);
  if (!parsed.success) return invalidFormState(parsed.error, formValues(formData));
  let id: string;
  try {
    id = (await createRun(await requireActor(), parsed.data)).id;
  } catch (error) {
    return { ...formError(error), values: formValues(formData) };
  }
  revalidatePath(`/notebooks/${parsed.data.notebookId}`);
  redirect(`/runs/${id}`);
}
