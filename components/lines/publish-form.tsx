"use client";
// The lab lead's form that publishes the draft as the team's next release, with notes. Publishing
// cannot be undone (the release is frozen and the whole team is e-mailed), so it asks first.
import { useActionState, useRef, useState } from "react";
import { Button } from "@/components/ui/button";
import { ConfirmDialog } from "@/components/ui/confirm-dialog";
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
  const [asking, setAsking] = useState(false);
  const form = useRef<HTMLFormElement>(null);
  return (
    <form ref={form} action={formAction} className="flex flex-col gap-3" noValidate>
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
        <Button data-publish type="button" pending={pending} onClick={() => setAsking(true)}>
          Publish as release {nextNumber}
        </Button>
      </div>
      <ConfirmDialog
        open={asking}
        title={`Publish release ${nextNumber}?`}
        confirmLabel={`Publish release ${nextNumber}`}
        onConfirm={() => {
          setAsking(false);
          form.current?.requestSubmit();
        }}
        onCancel={() => {
          setAsking(false);
          form.current?.querySelector<HTMLButtonElement>("[data-publish]")?.focus();
        }}
      >
        <p>
          Release {nextNumber} is frozen once published: it can never be changed, and everyone in
          the team is e-mailed. New identifications use it from then on.
        </p>
      </ConfirmDialog>
    </form>
  );
}
