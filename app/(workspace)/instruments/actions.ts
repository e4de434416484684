"use server";
// Server actions of the instruments area: a lab lead adds an instrument; a chemist calibrates one from a
// lamp spectrum. Each parses its form, calls one service and maps the result; the services authorise.
import { revalidatePath } from "next/cache";
import { redirect } from "next/navigation";
import { currentActor } from "@/lib/auth/session";
import { unauthenticated } from "@/lib/errors";
import { createCalibration } from "@/lib/services/calibrations";
import { createInstrument } from "@/lib/services/instruments";
import { formError, type FormState } from "@/lib/validation/form-state";
import {
  calibrationInputFromForm,
  formValues,
  instrumentInputFromForm,
  invalidFormState,
} from "@/lib/validation/workflow-forms";

async function actorOrThrow() {
  const actor = await currentActor();
  if (!actor) throw unauthenticated();
  return actor;
}

export async function createInstrumentAction(_state: FormState, formData: FormData): Promise<FormState> {
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

export async function calibrateAction(_state: FormState, formData: FormData): Promise<FormState> {
  const parsed = calibrationInputFromForm(formData);
  if (!parsed.success) return invalidFormState(parsed.error, formValues(formData));
  let id: string;
  try {
    id = (await createCalibration(await actorOrThrow(), parsed.data)).id;
  } catch (error) {
    return { ...formError(error), values: formValues(formData) };
  }
  revalidatePath(`/instruments/${parsed.data.instrumentId}`);
  revalidatePath("/instruments");
  redirect(`/calibrations/${id}`);
}
