// Turns a zod error into the field → messages map that forms and API replies share, and a failed
// parse of a request's fields into the 400 that carries that map.
import type { z } from "zod";
import { AppError, type FieldErrors } from "@/lib/errors";

export function zodFieldErrors(error: z.ZodError): FieldErrors {
  const fields: FieldErrors = {};
  for (const issue of error.issues) {
    const key = issue.path.length ? issue.path.join(".") : "_";
    (fields[key] ??= []).push(issue.message);
  }
  return fields;
}

/** `value` parsed by `schema`, or a validation error (400): `message` above each field's messages. */
export function parseFields<T extends z.ZodType>(
  schema: T,
  value: unknown,
  message = "Some fields are not right.",
): z.infer<T> {
  const parsed = schema.safeParse(value);
  if (parsed.success) return parsed.data;
  throw new AppError("validation", message, { fieldErrors: zodFieldErrors(parsed.error) });
}
