"use server";
// Server actions of the instruments area: a lab lead adds or edits an instrument. Each parses its form,
// calls one service and maps the result; the service authorises. (Calibrating is saved from the workbench's own action.)
import { revalidatePath } from "next/cache";
import { redirect } from "next/navigation";
import { currentActor } from "@/lib/auth/session";
import { unauthenticated } from "@/lib/errors";
import { createInstrument, updateInstrument } from "@/lib/services/instruments";
import { formError, invalidFormState, type FormState } from "@/lib/validation/form-state";
import { idParam } from "@/lib/validation/line-schemas";
import { formValues } from "@/lib/validation/form-data";
import {
  instrumentInputFromForm,
  instrumentUpdateFromForm,
} from "@/lib/validation/instrument-schemas";

async function actorOrThrow() {
  const actor = await currentActor();
  if (!actor) throw unauthenticated();
  return actor;
}

export async function createInstrumentAction(
  _state: FormState,
  formData: FormData,
): Promise<FormState> {
  const parsed = instrumentInputFromForm(formData);
  if (!parsed.success) return invalidFormState(parsed.error, formValues(formData));
  let id: string;
  try {
    id = (await createInstrument(await actorOrThrow(), parsed.data)).id;
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
    await updateInstrument(await actorOrThrow(), id, parsed.data);
  } catch (error) {
    return { ...formError(error), values: formValues(formData) };
  }
  revalidatePath("/instruments");
  revalidatePath(`/instruments/${id}`);
  redirect(`/instruments/${id}`);
}
