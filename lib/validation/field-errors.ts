// Turns a zod error into the field → messages map that forms and API replies share.
import type { z } from "zod";
import type { FieldErrors } from "@/lib/errors";

export function zodFieldErrors(error: z.ZodError): FieldErrors {
  const fields: FieldErrors = {};
  for (const issue of error.issues) {
    const key = issue.path.length ? issue.path.join(".") : "_";
    (fields[key] ??= []).push(issue.message);
  }
  return fields;
}
