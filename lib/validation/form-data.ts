// Readers of a form's FormData: the pages' forms send strings, and these turn them into what the schemas
// take (trimmed text, numbers written with a point or a comma, blank = not given), or keep what was typed
// to show it again after a failed submit.

export const blank = (value: FormDataEntryValue | null) =>
  typeof value === "string" ? value.trim() : "";

export const numberOrUndefined = (value: FormDataEntryValue | null) => {
  const text = blank(value).replace(",", ".");
  return text === "" ? undefined : Number(text);
};

/** The values typed into a form, shown again after a failed submit. */
export function formValues(formData: FormData): Record<string, string> {
  const values: Record<string, string> = {};
  for (const [key, value] of formData)
    if (typeof value === "string" && !key.startsWith("$")) values[key] = value;
  return values;
}
