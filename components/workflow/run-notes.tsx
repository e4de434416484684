"use client";
// The run's notes: a text area saved with a server action (Ctrl+Enter or ⌘+Enter saves), with an
// indicator that says whether what is shown is saved. A stale copy is refused and says so.
import { useActionState, useRef, useState } from "react";
import { Button } from "@/components/ui/button";
import { FormMessage } from "@/components/ui/form-message";
import { initialFormState, type FormState } from "@/lib/validation/form-state";

export function RunNotes({
  notes,
  lockVersion,
  editable,
  action,
}: {
  notes: string;
  lockVersion: number;
  /** False once the run is submitted or signed, or for anyone but its author. */
  editable: boolean;
  action: (state: FormState, formData: FormData) => Promise<FormState>;
}) {
  const [state, formAction, pending] = useActionState(action, initialFormState);
  const savedNotes = state.ok ? (state.values?.notes ?? notes) : notes;
  const version = state.ok ? Number(state.values?.lockVersion ?? lockVersion) : lockVersion;
  const [text, setText] = useState(notes);
  const form = useRef<HTMLFormElement>(null);
  if (!editable) {
    return (
      <div className="panel max-w-3xl whitespace-pre-wrap p-3 text-sm" data-testid="run-notes">
        {notes || <span className="muted">No notes.</span>}
      </div>
    );
  }
  const dirty = text !== savedNotes;
  return (
    <form
      ref={form}
      action={formAction}
      className="flex max-w-3xl flex-col gap-2"
      aria-label="Run notes"
      data-testid="notes-form"
    >
      <input type="hidden" name="lockVersion" value={version} />
      <label htmlFor="run-notes" className="sr-only">
        Notes
      </label>
      <textarea
        id="run-notes"
        name="notes"
        rows={5}
        value={text}
        onChange={(event) => setText(event.target.value)}
        onKeyDown={(event) => {
          if (event.key === "Enter" && (event.ctrlKey || event.metaKey)) {
            event.preventDefault();
            form.current?.requestSubmit();
          }
        }}
        aria-describedby="run-notes-hint notes-error"
        className="rounded border border-[var(--line)] bg-[var(--panel)] px-2 py-1.5 text-sm"
      />
      <div className="flex items-center gap-3">
        <Button type="submit" variant="quiet" pending={pending} disabled={!dirty}>
          {pending ? "Saving…" : "Save notes"}
        </Button>
        <span
          id="run-notes-hint"
          className="muted text-xs"
          role="status"
          aria-live="polite"
          data-testid="notes-status"
        >
          {pending ? "Saving…" : dirty ? "Unsaved changes · Ctrl+Enter saves" : "Saved"}
        </span>
      </div>
      <div id="notes-error">{state.ok ? null : <FormMessage message={state.message} />}</div>
    </form>
  );
}
