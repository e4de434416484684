"use server";
// Server actions of the instruments area: a lab lead adds or edits an instrument. Each parses its form,
// calls one service and maps the result; the service authorises. (Calibrating is saved from the workbench's own action.)
import { revalidatePath } from "next/cache";
import { redirect } from "next/navigation";
import { requireActor } from "@/lib/auth/session";
import { createInstrument, updateInstrument } from "@/lib/services/instruments";
import { formError, invalidFormState, type FormState } from "@/lib/validation/form-state";
import { formValues } from "@/lib/validation/form-data";
import {
  instrumentInputFromForm,
  instrumentUpdateFromForm,
} from "@/lib/validation/instrument-schemas";
import { idParam } from "@/lib/validation/request-params";

export async function createInstrumentAction(
  _state: FormState,
  formData: FormData,
): Promise<FormState> {
  const parsed = instrumentInputFromForm(formData);
  if (!parsed.success) return invalidFormState(parsed.error, formValues(formData));
  let id: string;
  try {
    id = (await createInstrument(await requireActor(), parsed.data)).id;
  } catch (error) {
    return { ...formError(error), values: formValues(formData) };
  }
  revalidatePath("/instruments");
  redirect(`/instruments/${id}`);
}

/** Saves the edit form; on success back to the instrument's page, otherwise the form with its messages. */
export async function updateInstrumentAction(
  _state: FormState,
  formData: FormData,
): Promise<FormState> {
  const parsed = instrumentUpdateFromForm(formData);
  if (!parsed.success) return invalidFormState(parsed.error, formValues(formData));
  let id: string;
  try {
    id = idParam(String(formData.get("instrumentId") ?? ""), "No such instrument.");
    await updateInstrument(await requireActor(), id, parsed.data);
  } catch (error) {
    return { ...formError(error), values: formValues(formData) };
  }
  revalidatePath("/instruments");
  revalidatePath(`/instruments/${id}`);
  redirect(`/instruments/${id}`);
}
