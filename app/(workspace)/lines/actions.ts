"use server";
// Server actions of the line library: open the draft, add, correct, retire, restore and verify lines,
// import a CSV (preview, then apply), and publish. Each parses its form, calls one service and maps
// the result; the services authorise.
import { revalidatePath } from "next/cache";
import { redirect } from "next/navigation";
import { z } from "zod";
import { requireActor } from "@/lib/auth/session";
import { expectedError } from "@/lib/errors";
import {
  addLine,
  openDraft,
  restoreLine,
  retireLine,
  updateLine,
  verifyLine,
} from "@/lib/services/line-library-draft";
import { applyImport, previewImport } from "@/lib/services/line-library-import";
import { publishDraft } from "@/lib/services/line-library-releases";
import { applyReferenceCheck, previewReferenceCheck } from "@/lib/services/line-reference-check";
import { FIELDS_NEED_ANOTHER_LOOK, formError, parseForm } from "@/lib/validation/form-state";
import {
  importApplyFormSchema,
  importPreviewFormSchema,
  keepEditedWavelength,
  lineAddSchema,
  lineChangeSchema,
  lineCorrectionSchema,
  parseLineInputForm,
  publishFormSchema,
  referenceApplyFormSchema,
  referenceCheckFormSchema,
  referenceDecisionsOf,
  toImportPreviewView,
  toLineFormFieldErrors,
  type ImportFormState,
  type LineFormState,
  type ReferenceCheckFormState,
} from "@/lib/validation/line-forms";
import {
  IMPORT_TOO_LARGE_MESSAGE,
  MAX_IMPORT_BYTES,
  MAX_REFERENCE_BYTES,
  REFERENCE_TOO_LARGE_MESSAGE,
} from "@/lib/validation/line-schemas";

const CONFLICT_MESSAGE = "Someone else changed this line first. Reload to see their change.";

/** Like formError, with the optimistic-locking answer (409) worded for the line library. */
function lineFormError(error: unknown): LineFormState {
  if (expectedError(error)?.code === "conflict")
    return { message: CONFLICT_MESSAGE, conflict: true };
  const state = formError(error);
  return { ...state, fieldErrors: toLineFormFieldErrors(state.fieldErrors) };
}

function revalidateLines() {
  revalidatePath("/lines", "layout");
}

export async function openDraftAction(formData: FormData): Promise<void> {
  const teamId = z.uuid().parse(formData.get("teamId"));
  await openDraft(await requireActor(), teamId);
  revalidateLines();
  redirect("/lines/draft");
}

export async function addLineAction(
  _state: LineFormState,
  formData: FormData,
): Promise<LineFormState> {
  const { data, state } = parseForm(lineAddSchema, formData);
  const values = parseLineInputForm(formData);
  if (state || values.fieldErrors) {
    return {
      message: FIELDS_NEED_ANOTHER_LOOK,
      fieldErrors: { ...state?.fieldErrors, ...values.fieldErrors },
    };
  }
  try {
    await addLine(await requireActor(), {
      releaseId: data.releaseId,
      line: values.input,
      reason: data.reason,
    });
  } catch (error) {
    return lineFormError(error);
  }
  revalidateLines();
  return {
    ok: true,
    message: `${values.input.species} ${values.input.airNm ?? values.input.vacuumNm} nm is in the draft.`,
  };
}

export async function correctLineAction(
  _state: LineFormState,
  formData: FormData,
): Promise<LineFormState> {
  const { data, state } = parseForm(lineCorrectionSchema, formData);
  keepEditedWavelength(formData);
  const values = parseLineInputForm(formData);
  if (state || values.fieldErrors) {
    return {
      message: FIELDS_NEED_ANOTHER_LOOK,
      fieldErrors: { ...state?.fieldErrors, ...values.fieldErrors },
    };
  }
  try {
    await updateLine(await requireActor(), {
      lineId: data.lineId,
      version: data.version,
      line: values.input,
      reason: data.reason,
    });
  } catch (error) {
    return lineFormError(error);
  }
  revalidateLines();
  return { ok: true, message: "The correction is in the draft." };
}

const CHANGE_DONE = {
  retire: "Retired in the draft.",
  restore: "Restored in the draft.",
  verify: "Marked verified.",
};

export async function changeLineAction(
  _state: LineFormState,
  formData: FormData,
): Promise<LineFormState> {
  const { data, state } = parseForm(lineChangeSchema, formData);
  if (state) return state;
  const change = { retire: retireLine, restore: restoreLine, verify: verifyLine }[data.change];
  try {
    await change(await requireActor(), {
      lineId: data.lineId,
      version: data.version,
      reason: data.reason,
    });
  } catch (error) {
    return lineFormError(error);
  }
  revalidateLines();
  return { ok: true, message: CHANGE_DONE[data.change] };
}

/**
 * Browsers send a form's text fields with CRLF line breaks (multipart/form-data), and a file as it
 * is: one line-break convention keeps the preview's fingerprint valid when the text comes back.
 */
const oneLineBreak = (text: string) => text.replace(/\r\n?/g, "\n");

/** The CSV text of the import or reference form: the chosen file (up to maxBytes), or else the pasted text. */
async function importText(
  formData: FormData,
  maxBytes: number,
): Promise<string | { tooLarge: true }> {
  const file = formData.get("file");
  if (file instanceof File && file.size > 0) {
    if (file.size > maxBytes) return { tooLarge: true };
    return oneLineBreak(await file.text());
  }
  return oneLineBreak(String(formData.get("csv") ?? ""));
}

async function previewImportStep(formData: FormData): Promise<ImportFormState> {
  const text = await importText(formData, MAX_IMPORT_BYTES);
  if (typeof text !== "string") {
    return { message: IMPORT_TOO_LARGE_MESSAGE };
  }
  const { data, state } = parseForm(
    importPreviewFormSchema,
    toFormData({ releaseId: formData.get("releaseId"), csv: text }),
  );
  if (state) return state;
  try {
    const preview = await previewImport(await requireActor(), {
      releaseId: data.releaseId,
      csvText: data.csv,
    });
    return { ok: true, view: toImportPreviewView(preview), csv: data.csv };
  } catch (error) {
    return lineFormError(error);
  }
}

async function applyImportStep(
  state: ImportFormState,
  formData: FormData,
): Promise<ImportFormState> {
  formData.set("csv", oneLineBreak(String(formData.get("csv") ?? "")));
  const parsed = parseForm(importApplyFormSchema, formData);
  if (parsed.state) return { ...state, ...parsed.state, ok: false };
  const { data } = parsed;
  let result: { added: number; changed: number };
  try {
    // The lead has seen the rejected rows in the preview: applying means "without them".
    result = await applyImport(await requireActor(), {
      releaseId: data.releaseId,
      csvText: data.csv,
      fingerprint: data.fingerprint,
      skipRejected: true,
      reason: data.reason,
    });
  } catch (error) {
    const failed = lineFormError(error);
    if (failed.conflict) {
      failed.message =
        "The draft or the file changed since this preview was made. Discard it and preview the file again.";
    }
    return { ...state, ...failed, ok: false };
  }
  revalidateLines();
  const { added, changed } = result;
  return {
    ok: true,
    message: `Applied: ${added} ${added === 1 ? "line" : "lines"} added and ${changed} changed in the draft.`,
    applied: { added, changed },
  };
}

/** The import form: preview a file, apply the previewed file, or discard the preview. */
export async function importAction(
  state: ImportFormState,
  formData: FormData,
): Promise<ImportFormState> {
  const intent = formData.get("intent");
  if (intent === "apply") return applyImportStep(state, formData);
  if (intent === "discard") return {};
  return previewImportStep(formData);
}

async function previewReferenceStep(formData: FormData): Promise<ReferenceCheckFormState> {
  const text = await importText(formData, MAX_REFERENCE_BYTES);
  if (typeof text !== "string") {
    return { message: REFERENCE_TOO_LARGE_MESSAGE };
  }
  const { data, state } = parseForm(
    referenceCheckFormSchema,
    toFormData({
      releaseId: formData.get("releaseId"),
      csv: text,
      medium: formData.get("medium"),
    }),
  );
  if (state) return state;
  try {
    const preview = await previewReferenceCheck(await requireActor(), {
      releaseId: data.releaseId,
      csvText: data.csv,
      medium: data.medium,
    });
    return { ok: true, preview, csv: data.csv, medium: data.medium };
  } catch (error) {
    return lineFormError(error);
  }
}

async function applyReferenceStep(
  state: ReferenceCheckFormState,
  formData: FormData,
): Promise<ReferenceCheckFormState> {
  formData.set("csv", oneLineBreak(String(formData.get("csv") ?? "")));
  const parsed = parseForm(referenceApplyFormSchema, formData);
  if (parsed.state) return { ...state, ...parsed.state, ok: false };
  const { data } = parsed;
  try {
    const applied = await applyReferenceCheck(await requireActor(), {
      releaseId: data.releaseId,
      csvText: data.csv,
      medium: data.medium,
      fingerprint: data.fingerprint,
      decisions: referenceDecisionsOf(formData),
      reason: data.reason,
    });
    revalidateLines();
    const rows = (n: number) => `${n} ${n === 1 ? "row" : "rows"}`;
    return {
      ok: true,
      applied,
      message:
        `Marked ${rows(applied.verified)} verified` +
        (applied.taken ? ` (${applied.taken} with the reference value taken)` : "") +
        (applied.kept ? `; kept our value in ${rows(applied.kept)}` : "") +
        (applied.left ? `; ${rows(applied.left)} left for later` : "") +
        ".",
    };
  } catch (error) {
    const failed = lineFormError(error);
    if (failed.conflict) {
      failed.message =
        "The draft or the file changed since this check was made. Discard it and check the file again.";
    }
    return { ...state, ...failed, ok: false };
  }
}

/** The reference check's form: check a file (preview), confirm the previewed check, or discard it. */
export async function referenceCheckAction(
  state: ReferenceCheckFormState,
  formData: FormData,
): Promise<ReferenceCheckFormState> {
  const intent = formData.get("intent");
  if (intent === "apply") return applyReferenceStep(state, formData);
  if (intent === "discard") return {};
  return previewReferenceStep(formData);
}

export async function publishAction(
  _state: LineFormState,
  formData: FormData,
): Promise<LineFormState> {
  const { data, state } = parseForm(publishFormSchema, formData);
  if (state) return state;
  let number: number | null;
  try {
    const release = await publishDraft(await requireActor(), {
      releaseId: data.releaseId,
      notes: data.notes,
    });
    number = release.number;
  } catch (error) {
    return lineFormError(error);
  }
  revalidateLines();
  redirect(`/lines?published=${number ?? ""}`);
}

function toFormData(values: Record<string, FormDataEntryValue | null>): FormData {
  const formData = new FormData();
  for (const [key, value] of Object.entries(values)) if (value !== null) formData.set(key, value);
  return formData;
}
