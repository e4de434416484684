// The state every form's server action returns: field errors plus one message.
import { expectedError, type FieldErrors } from "@/lib/errors";
import type { z } from "zod";
import { zodFieldErrors } from "./field-errors";

export interface FormState {
  ok?: boolean;
  message?: string | null;
  fieldErrors?: FieldErrors;
  /** Values to show again after a failed submit, or that a success message is about (never passwords). */
  values?: Record<string, string>;
}

export const initialFormState: FormState = {};

/** Parses FormData with a schema: the data, or the FormState to return. */
export function parseForm<T extends z.ZodType>(
  schema: T,
  formData: FormData,
): { data: z.infer<T>; state?: undefined } | { data?: undefined; state: FormState } {
  const parsed = schema.safeParse(Object.fromEntries(formData));
  if (parsed.success) return { data: parsed.data };
  return { state: invalidFormState(parsed.error) };
}

/** What a form says above its fields when some of them are refused. */
export const FIELDS_NEED_ANOTHER_LOOK = "Some fields need another look.";

/** Field errors of a failed parse, with the one message every form shows above them. */
export function invalidFormState(error: z.ZodError, values?: Record<string, string>): FormState {
  return { message: FIELDS_NEED_ANOTHER_LOOK, fieldErrors: zodFieldErrors(error), values };
}

/** Maps an expected error to FormState; anything else is re-thrown to the error boundary. */
export function formError(error: unknown): FormState {
  const expected = expectedError(error);
  if (expected) return { message: expected.message, fieldErrors: expected.fieldErrors };
  throw error;
}
