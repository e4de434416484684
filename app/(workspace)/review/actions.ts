"use server";
// Server actions of review and sign-off: submit a run, amend a signed one, mark a call or line, return
// or sign. Each parses its form, calls one service and maps the result; the services authorise.
import { revalidatePath } from "next/cache";
import { headers } from "next/headers";
import { redirect } from "next/navigation";
import { requireActor } from "@/lib/auth/session";
import { clientAddress } from "@/lib/http/client-address";
import { amendRun } from "@/lib/services/run-amendments";
import { addReviewMark, reviewRun, submitRun } from "@/lib/services/run-review-decisions";
import { formError, invalidFormState, type FormState } from "@/lib/validation/form-state";
import {
  decisionInputFromForm,
  markInputFromForm,
  submitInputFromForm,
} from "@/lib/validation/review-schemas";

const runIdOf = (formData: FormData) => String(formData.get("runId") ?? "");

function refreshRun(runId: string) {
  revalidatePath(`/runs/${runId}`);
  revalidatePath(`/review/${runId}`);
  revalidatePath("/review");
}

export async function submitRunAction(_state: FormState, formData: FormData): Promise<FormState> {
  const parsed = submitInputFromForm(formData);
  if (!parsed.success) return invalidFormState(parsed.error);
  const runId = runIdOf(formData);
  try {
    await submitRun(await requireActor(), runId, parsed.data);
  } catch (error) {
    return formError(error);
  }
  refreshRun(runId);
  return { ok: true, message: "Submitted for review: the reviewers have been e-mailed." };
}

export async function amendRunAction(_state: FormState, formData: FormData): Promise<FormState> {
  const runId = runIdOf(formData);
  let amendmentId: string;
  try {
    amendmentId = (await amendRun(await requireActor(), runId)).id;
  } catch (error) {
    return formError(error);
  }
  refreshRun(runId);
  redirect(`/runs/${amendmentId}`);
}

export async function addMarkAction(_state: FormState, formData: FormData): Promise<FormState> {
  const values = { comment: String(formData.get("comment") ?? "") };
  const parsed = markInputFromForm(formData);
  if (!parsed.success) return invalidFormState(parsed.error, values);
  const runId = runIdOf(formData);
  try {
    await addReviewMark(await requireActor(), runId, parsed.data);
  } catch (error) {
    return { ...formError(error), values };
  }
  revalidatePath(`/review/${runId}`);
  return { ok: true, message: "Mark recorded." };
}

export async function decideRunAction(_state: FormState, formData: FormData): Promise<FormState> {
  const values = { comment: String(formData.get("comment") ?? "") };
  const parsed = decisionInputFromForm(formData);
  if (!parsed.success) return invalidFormState(parsed.error, values);
  const runId = runIdOf(formData);
  const address = clientAddress(await headers());
  try {
    await reviewRun(await requireActor(), runId, parsed.data, { address });
  } catch (error) {
    return { ...formError(error), values };
  }
  refreshRun(runId);
  redirect(`/review/${runId}`);
}
