"use client";
// The lab lead's form that publishes the draft as the team's next release, with notes.
import { useActionState } from "react";
import { Button } from "@/components/ui/button";
import { FormMessage } from "@/components/ui/form-message";
import { initialFormState, type FormState } from "@/lib/validation/form-state";

export function PublishForm({
  releaseId,
  nextNumber,
  action,
}: {
  releaseId: string;
  nextNumber: number;
  action: (state: FormState, formData: FormData) => Promise<FormState>;
}) {
  const [state, formAction, pending] = useActionState(action, initialFormState);
  return (
    <form action={formAction} className="flex flex-col gap-3" noValidate>
      <input type="hidden" name="releaseId" value={releaseId} />
      <div className="flex flex-col gap-1">
        <label htmlFor="notes" className="text-sm font-medium">
          Release notes
        </label>
        <textarea
          id="notes"
          name="notes"
          rows={4}
          required
          aria-describedby="notes-hint notes-error"
          aria-invalid={state.fieldErrors?.notes ? true : undefined}
          className="rounded border border-[var(--line)] bg-[var(--panel)] px-2 py-1.5 text-sm aria-[invalid=true]:border-red-600"
        />
        <p id="notes-hint" className="muted text-xs">
          What changed and why; the team reads these in the e-mail and beside the release.
        </p>
        <div id="notes-error" aria-live="polite" className="text-xs text-red-700 dark:text-red-300">
          {state.fieldErrors?.notes?.join(" ")}
        </div>
      </div>
      <p className="rounded border border-ember-300 bg-ember-50 p-2 text-sm text-ember-900 dark:border-ember-700 dark:bg-ink-800 dark:text-ember-100">
        Publishing makes this draft release {nextNumber}. Everyone in the team is e-mailed, and the
        release is then frozen: it can never be changed again, and later corrections go into a new
        draft. Retired lines are left out of it.
      </p>
      <FormMessage message={state.message} tone={state.ok ? "ok" : "error"} />
      <div>
        <Button type="submit" pending={pending}>
          Publish as release {nextNumber}
        </Button>
      </div>
    </form>
  );
}
