"use client";
// The run's notes: a text area saved with a server action (Ctrl+Enter or ⌘+Enter saves), with an
// indicator that says whether what is shown is saved. A stale copy is refused; the user's text stays
// in the box and the newer saved notes are shown beside it, to take or to save over.
import { useActionState, useRef, useState } from "react";
import { Button } from "@/components/ui/button";
import { FormMessage } from "@/components/ui/form-message";
import { initialFormState } from "@/lib/validation/form-state";
import type { RunNotesState } from "@/lib/validation/run-schemas";

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
  action: (state: RunNotesState, formData: FormData) => Promise<RunNotesState>;
}) {
  const [state, formAction, pending] = useActionState(action, initialFormState as RunNotesState);
  const [text, setText] = useState(notes);
  // The newer notes the user has dealt with (taken, or chosen to save over), by their version.
  const [settledVersion, setSettledVersion] = useState<number | null>(null);
  const form = useRef<HTMLFormElement>(null);
  const newer =
    !state.ok && state.newer && state.newer.lockVersion !== settledVersion ? state.newer : null;
  const savedNotes = state.ok ? (state.values?.notes ?? notes) : (state.newer?.notes ?? notes);
  // Saving over the newer notes (or after taking them) goes against their version.
  const version = state.ok
    ? Number(state.values?.lockVersion ?? lockVersion)
    : (state.newer?.lockVersion ?? lockVersion);
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
      <div className={newer ? "grid gap-3 md:grid-cols-2" : ""}>
        <div className="flex flex-col gap-1">
          <label htmlFor="run-notes" className={newer ? "text-sm font-medium" : "sr-only"}>
            {newer ? "Your text (not saved)" : "Notes"}
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
        </div>
        {newer ? (
          <section
            aria-labelledby="newer-notes-title"
            className="flex flex-col gap-1"
            data-testid="newer-notes"
          >
            <h3 id="newer-notes-title" className="text-sm font-medium">
              Saved meanwhile (newer)
            </h3>
            <div className="panel min-h-[7.5rem] whitespace-pre-wrap p-2 text-sm">
              {newer.notes || <span className="muted">Empty: the notes were cleared.</span>}
            </div>
            <div className="flex flex-wrap gap-2">
              <Button
                type="button"
                variant="quiet"
                onClick={() => {
                  setSettledVersion(newer.lockVersion);
                  setText(newer.notes);
                }}
              >
                Take the newer notes
              </Button>
              {/* Submits against the newer version; the panel goes once the save succeeds. */}
              <Button type="submit" variant="quiet">
                Save my text over them
              </Button>
            </div>
          </section>
        ) : null}
      </div>
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
      <div id="notes-error">
        {state.ok ? null : (
          <FormMessage
            message={
              newer
                ? "Someone saved these notes since you opened them. Your text is kept on the left; take the newer notes, or save yours over them."
                : state.message
            }
          />
        )}
      </div>
    </form>
  );
}
