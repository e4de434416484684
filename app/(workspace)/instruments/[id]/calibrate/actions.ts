"use server";
// The workbench's save: the same input the preview was computed from, parsed with the API's schema and
// handed to the same service, so the saved calibration is the one the chemist looked at.
import { revalidatePath } from "next/cache";
import { redirect } from "next/navigation";
import { requireActor } from "@/lib/auth/session";
import { createCalibration } from "@/lib/services/calibrations";
import { formError, invalidFormState, type FormState } from "@/lib/validation/form-state";
import { calibrationCreateSchema } from "@/lib/validation/calibration-schemas";

export async function saveCalibrationAction(input: unknown): Promise<FormState> {
  const parsed = calibrationCreateSchema.safeParse(input);
  if (!parsed.success) return invalidFormState(parsed.error);
  const actor = await requireActor();
  let id: string;
  try {
    id = (await createCalibration(actor, parsed.data)).id;
  } catch (error) {
    return formError(error);
  }
  revalidatePath(`/instruments/${parsed.data.instrumentId}`);
  revalidatePath("/instruments");
  redirect(`/calibrations/${id}`);
}
