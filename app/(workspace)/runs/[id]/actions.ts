"use server";
// Server actions of the run page: override a call, save the notes, run again on a newer release. Each
// parses its form, calls the same service as the API and maps the result; the services authorise.
import { revalidatePath } from "next/cache";
import { redirect } from "next/navigation";
import { requireActor } from "@/lib/auth/session";
import { AppError } from "@/lib/errors";
import { fetchRun, overrideCall, rerunRun, updateRunNotes } from "@/lib/services/runs";
import { formError, invalidFormState, type FormState } from "@/lib/validation/form-state";
import {
  runNotesFromForm,
  runOverrideFromForm,
  type RunNotesState,
} from "@/lib/validation/run-schemas";

export async function overrideCallAction(
  runId: string,
  _state: FormState,
  formData: FormData,
): Promise<FormState> {
  const parsed = runOverrideFromForm(formData);
  const values = {
    verdict: String(formData.get("verdict") ?? ""),
    reason: String(formData.get("reason") ?? ""),
  };
  if (!parsed.success) return invalidFormState(parsed.error, values);
  try {
    await overrideCall(await requireActor(), runId, parsed.data);
  } catch (error) {
    return { ...formError(error), values };
  }
  revalidatePath(`/runs/${runId}`);
  return {
    ok: true,
    message: parsed.data.verdict === null ? "Override withdrawn." : "Override saved.",
  };
}

export async function saveRunNotesAction(
  runId: string,
  _state: RunNotesState,
  formData: FormData,
): Promise<RunNotesState> {
  const parsed = runNotesFromForm(formData);
  const values = {
    notes: String(formData.get("notes") ?? ""),
    lockVersion: String(formData.get("lockVersion") ?? ""),
  };
  if (!parsed.success) return invalidFormState(parsed.error, values);
  const actor = await requireActor();
  try {
    const run = await updateRunNotes(actor, runId, parsed.data);
    revalidatePath(`/runs/${runId}`);
    return {
      ok: true,
      message: "Notes saved.",
      values: { notes: run.notes, lockVersion: String(run.lockVersion) },
    };
  } catch (error) {
    const state: RunNotesState = { ...formError(error), values };
    // A stale copy: the form keeps the user's text and shows the newer notes beside it, so
    // neither is lost and the user chooses.
    if (error instanceof AppError && error.code === "conflict") {
      const run = await fetchRun(actor, runId);
      const editable = run.status === "draft" || run.status === "returned";
      if (
        editable &&
        run.lockVersion !== parsed.data.lockVersion &&
        run.notes !== parsed.data.notes
      ) {
        state.newer = { notes: run.notes, lockVersion: run.lockVersion };
      }
    }
    return state;
  }
}

export async function rerunAction(
  runId: string,
  _state: FormState,
  _formData: FormData,
): Promise<FormState> {
  void _formData;
  let id: string;
  try {
    id = (await rerunRun(await requireActor(), runId)).id;
  } catch (error) {
    return formError(error);
  }
  redirect(`/runs/${id}`);
}
