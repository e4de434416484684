"use client";
// Renames a notebook: the new title and the version the page showed, so that a rename made meanwhile
// by someone else is refused (with the title it has now) instead of being overwritten.
import { useActionState } from "react";
import { Button } from "@/components/ui/button";
import { Field } from "@/components/ui/field";
import { FormMessage } from "@/components/ui/form-message";
import { initialFormState, type FormState } from "@/lib/validation/form-state";

export function RenameNotebookForm({
  notebookId,
  title,
  version,
  action,
}: {
  notebookId: string;
  title: string;
  version: number;
  action: (state: FormState, formData: FormData) => Promise<FormState>;
}) {
  const [state, formAction, pending] = useActionState(action, initialFormState);
  return (
    <details
      className="mb-4 max-w-xl"
      open={Boolean(state.fieldErrors || (state.message && !state.ok)) || undefined}
    >
      <summary className="cursor-pointer text-sm underline">Rename the notebook</summary>
      <form
        action={formAction}
        className="panel mt-2 flex flex-col gap-3 p-4"
        noValidate
        aria-label="Rename the notebook"
      >
        <input type="hidden" name="notebookId" value={notebookId} />
        <input type="hidden" name="version" value={version} />
        <Field
          label="New title"
          name="title"
          id="rename-title"
          key={`${version}-${title}`}
          defaultValue={state.ok ? title : (state.values?.title ?? title)}
          errors={state.fieldErrors?.title}
          maxLength={200}
          required
        />
        <FormMessage message={state.message} tone={state.ok ? "ok" : "error"} />
        <div>
          <Button type="submit" pending={pending}>
            {pending ? "Renaming…" : "Rename"}
          </Button>
        </div>
      </form>
    </details>
  );
}
