"use client";
// Opens a new notebook in the team (a title is all it needs).
import { useActionState } from "react";
import { Button } from "@/components/ui/button";
import { Field } from "@/components/ui/field";
import { FormMessage } from "@/components/ui/form-message";
import { initialFormState, type FormState } from "@/lib/validation/form-state";

export function NotebookForm({
  teamId,
  action,
}: {
  teamId: string;
  action: (state: FormState, formData: FormData) => Promise<FormState>;
}) {
  const [state, formAction, pending] = useActionState(action, initialFormState);
  return (
    <form action={formAction} className="panel flex max-w-xl flex-col gap-3 p-4" noValidate>
      <h2 className="text-lg font-semibold">Open a notebook</h2>
      <input type="hidden" name="teamId" value={teamId} />
      <Field
        label="Title"
        name="title"
        defaultValue={state.values?.title}
        errors={state.fieldErrors?.title}
      />
      <FormMessage message={state.message} />
      <div>
        <Button type="submit" pending={pending}>
          Open the notebook
        </Button>
      </div>
    </form>
  );
}
